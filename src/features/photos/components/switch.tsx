import { useId } from 'react';
import { cn } from '../../../lib/cn';

/** An on/off control that says its state: role="switch" with a visible label. */
export function Switch({ checked, onChange, label, hint, disabled }: { checked: boolean; onChange: (v: boolean) => void; label: string; hint?: string; disabled?: boolean }) {
  const id = useId();
  return (
    <div className="flex items-start gap-3">
      <button
        id={id}
        type="button"
        role="switch"
        aria-checked={checked}
        aria-describedby={hint ? `${id}-hint` : undefined}
        disabled={disabled}
        onClick={() => onChange(!checked)}
        className={cn(
          'relative mt-0.5 inline-flex h-6 w-11 shrink-0 items-center rounded-full border transition-colors disabled:opacity-60',
          checked ? 'border-verdigris-600 bg-verdigris-600' : 'border-sable-600 bg-primer-300',
        )}
      >
        <span className={cn('inline-block size-4 rounded-full bg-white shadow-raised transition-transform', checked ? 'translate-x-6' : 'translate-x-1')} />
      </button>
      <div className="text-sm">
        <label htmlFor={id} className="font-medium">
          {label}
        </label>
        {hint && (
          <p id={`${id}-hint`} className="text-xs text-sable-600">
            {hint}
          </p>
        )}
      </div>
    </div>
  );
}
