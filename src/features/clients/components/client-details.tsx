import type { ReactNode } from 'react';
import type { Client } from '../../../../shared/schemas/clients';

export function addressLines(client: Client): string[] {
  const a = client.address ?? {};
  const cityLine = [a.postalCode, a.city].filter(Boolean).join(' ');
  return [a.line1, a.line2, cityLine, a.region, a.country].filter((x): x is string => !!x);
}

function Row({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div className="grid gap-1 py-3 sm:grid-cols-[10rem_1fr]">
      <dt className="text-sm font-medium text-sable-600">{term}</dt>
      <dd className="text-sm break-words">{children}</dd>
    </div>
  );
}

const none = <span className="text-sable-600">—</span>;

/** Read-only view, for painters. */
export function ClientDetails({ client }: { client: Client }) {
  const lines = addressLines(client);
  return (
    <dl className="divide-y divide-primer-300">
      <Row term="E-mail">{client.email ? <a href={`mailto:${client.email}`}>{client.email}</a> : none}</Row>
      <Row term="Phone">{client.phone ?? none}</Row>
      <Row term="Shipping address">{lines.length ? lines.map((l) => <span key={l} className="block">{l}</span>) : none}</Row>
      <Row term="Notes">{client.notes ? <span className="whitespace-pre-line">{client.notes}</span> : none}</Row>
    </dl>
  );
}
