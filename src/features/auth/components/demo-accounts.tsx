import { Button } from '../../../components/ui/button';

const DEMO_ACCOUNTS = [
  { email: 'owner@demo.test', who: 'Studio owner' },
  { email: 'painter@demo.test', who: 'Painter' },
  { email: 'client@demo.test', who: 'Client' },
  { email: 'client2@demo.test', who: 'Another client' },
] as const;

/** Only shown when the server runs the demo; the password comes from /api/meta. */
export function DemoAccounts({ password, onPick }: { password: string; onPick: (email: string, password: string) => void }) {
  return (
    <section aria-labelledby="demo-accounts-title" className="rounded-card border border-glaze-500 bg-bone-50 p-4 text-sm">
      <h2 id="demo-accounts-title" className="font-semibold">
        Try the demo studio
      </h2>
      <p className="mt-1 text-sable-600">
        Every demo account uses the password <code className="rounded-control bg-primer-100 px-1 py-0.5 font-mono whitespace-nowrap text-sable-900">{password}</code>
      </p>
      <ul className="mt-3 divide-y divide-primer-300">
        {DEMO_ACCOUNTS.map((a) => (
          <li key={a.email} className="flex items-center justify-between gap-3 py-2">
            <span className="min-w-0">
              <span className="block truncate font-medium">{a.email}</span>
              <span className="block text-xs text-sable-600">{a.who}</span>
            </span>
            <Button variant="secondary" size="sm" onClick={() => onPick(a.email, password)} aria-label={`Fill in ${a.email}`}>
              Fill in
            </Button>
          </li>
        ))}
      </ul>
    </section>
  );
}
