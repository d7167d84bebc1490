import { SubNav } from '../../../components/ui/sub-nav';

const TABS = [
  { to: 'money', label: 'Overview', end: true },
  { to: 'quotes', label: 'Quotes', end: false },
  { to: 'invoices', label: 'Invoices', end: false },
  { to: 'money/prices', label: 'Prices', end: false },
  { to: 'reports', label: 'The books', end: false },
] as const;

/** The owner's way around the money screens; one rail entry ("Quotes & invoices") leads here. */
export function MoneyTabs({ studioId }: { studioId: number }) {
  const base = `/studio/${studioId}`;
  return <SubNav label="Quotes and invoices" className="mb-6" items={TABS.map((t) => ({ ...t, to: `${base}/${t.to}` }))} />;
}
