import { useState } from 'react';
import { Download } from 'lucide-react';
import { buttonClasses } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { invoicesCsvUrl } from '../api/export-csv';

/** Dates in, a CSV out: issued invoices and credit notes for the accountant. */
export function CsvExport({ studioId }: { studioId: number }) {
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const backwards = from !== '' && to !== '' && to < from;
  return (
    <div className="flex flex-wrap items-end gap-3">
      <TextField label="From" type="date" optional value={from} onChange={(e) => setFrom(e.target.value)} className="w-44" />
      <TextField label="To" type="date" optional value={to} onChange={(e) => setTo(e.target.value)} className="w-44" error={backwards ? 'The end is before the start.' : undefined} />
      <a
        href={backwards ? undefined : invoicesCsvUrl(studioId, { from, to })}
        aria-disabled={backwards || undefined}
        className={buttonClasses('secondary', 'md', 'no-underline')}
        download
      >
        <Download aria-hidden="true" className="size-4" />
        Download CSV
      </a>
    </div>
  );
}
