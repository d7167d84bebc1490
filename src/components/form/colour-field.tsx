import { useId, useState } from 'react';
import { CircleAlert } from 'lucide-react';
import { isHex, normalizeHex } from '../../../shared/color';
import { HEX_MESSAGE } from '../../../shared/schemas/paints';
import { cn } from '../../lib/cn';

/**
 * A colour as sRGB hex: the browser's colour picker beside a typed "#RRGGBB" entry. What is typed is
 * checked as it is typed, and the reason shows beside the field; the form gets the text as typed, so
 * its own schema refuses a bad value too.
 */
export function ColourField({
  label,
  value,
  onChange,
  onBlur,
  error,
  hint,
  optional,
  className,
  name,
}: {
  label: string;
  value: string;
  onChange: (value: string) => void;
  onBlur?: () => void;
  error?: string;
  hint?: string;
  optional?: boolean;
  className?: string;
  name?: string;
}) {
  const id = `c${useId()}`;
  const [text, setText] = useState(value);
  const [seen, setSeen] = useState(value);
  // Follow changes made from outside (a reset, a colour picked on a photo), adjusting during render.
  if (value !== seen) {
    setSeen(value);
    if (!sameColour(text, value)) setText(value);
  }

  const typedProblem = text.trim() !== '' && !isHex(text) ? HEX_MESSAGE : undefined;
  const shown = typedProblem ?? error;
  const valid = isHex(text) ? normalizeHex(text) : isHex(value) ? normalizeHex(value) : null;
  const errorId = shown ? `${id}-error` : undefined;
  const hintId = hint ? `${id}-hint` : undefined;

  return (
    <div className={cn('flex flex-col gap-1', className)}>
      <label htmlFor={id} className="text-sm font-medium text-sable-900">
        {label}
        {optional && <span className="font-normal text-sable-600"> (optional)</span>}
      </label>
      <div className="flex flex-wrap items-start gap-2">
        <input
          type="color"
          aria-label={`${label}: pick from a colour chart`}
          value={(valid ?? '#888888').toLowerCase()}
          onChange={(e) => {
            const hex = e.target.value.toUpperCase();
            setText(hex);
            onChange(hex);
          }}
          className="h-10 w-12 shrink-0 cursor-pointer rounded-control border border-sable-600 bg-white p-1"
        />
        <input
          id={id}
          name={name}
          value={text}
          inputMode="text"
          autoComplete="off"
          spellCheck={false}
          placeholder="#1F3A93"
          maxLength={9}
          aria-invalid={shown ? true : undefined}
          aria-describedby={[errorId, hintId].filter(Boolean).join(' ') || undefined}
          onChange={(e) => {
            setText(e.target.value);
            onChange(e.target.value.trim());
          }}
          onBlur={() => {
            if (isHex(text)) {
              const n = normalizeHex(text);
              setText(n);
              onChange(n);
            }
            onBlur?.();
          }}
          className="min-h-10 w-36 rounded-control border border-sable-600 bg-white px-3 font-mono text-base text-sable-900 uppercase placeholder:normal-case placeholder:text-sable-600 aria-invalid:border-2 aria-invalid:border-oxide-600"
        />
        {shown && (
          <p id={errorId} className="flex min-w-0 flex-1 basis-48 items-start gap-1 pt-2 text-sm text-oxide-600">
            <CircleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0" />
            <span>{shown}</span>
          </p>
        )}
      </div>
      {hint && (
        <p id={hintId} className="text-xs text-sable-600">
          {hint}
        </p>
      )}
    </div>
  );
}

function sameColour(a: string, b: string) {
  if (a.trim() === b.trim()) return true;
  return isHex(a) && isHex(b) && normalizeHex(a) === normalizeHex(b);
}
