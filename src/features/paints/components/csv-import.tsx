import { useId, useRef, useState } from 'react';
import { FileUp } from 'lucide-react';
import type { ImportReport } from '../../../../shared/schemas/paints';
import { Button } from '../../../components/ui/button';
import { ErrorNote, Note } from '../../../components/ui/error-note';
import { isApiError } from '../../../lib/api-client';
import { pluralize } from '../../../lib/format';
import { useStudioScope } from '../../../lib/studio-scope';
import { useImportPaints } from '../api/import-paints';

const MAX_BYTES = 900_000;

/** Choose a CSV file, send it, and read what came in and which lines were left out and why. */
export function CsvImport() {
  const { studioId } = useStudioScope();
  const run = useImportPaints(studioId);
  const input = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [report, setReport] = useState<ImportReport | null>(null);
  const hintId = useId();

  async function send() {
    setProblem(null);
    setReport(null);
    if (!file) {
      setProblem('Choose a CSV file first.');
      return;
    }
    if (file.size > MAX_BYTES) {
      setProblem('That file is over 900 kB. Split it into smaller files and import them one after another.');
      return;
    }
    try {
      setReport(await run.mutateAsync(await file.text()));
    } catch (err) {
      setProblem(isApiError(err) ? err.message : 'The file could not be sent. Try again.');
    }
  }

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-col gap-1">
        <label htmlFor="csv-file" className="text-sm font-medium">
          CSV file
        </label>
        <input
          id="csv-file"
          ref={input}
          type="file"
          accept=".csv,text/csv"
          aria-describedby={hintId}
          onChange={(e) => {
            setFile(e.target.files?.[0] ?? null);
            setReport(null);
            setProblem(null);
          }}
          className="text-sm file:mr-3 file:min-h-10 file:rounded-control file:border file:border-sable-600 file:bg-bone-50 file:px-4 file:text-sm file:font-medium file:text-sable-900"
        />
        <p id={hintId} className="text-xs text-sable-600">
          First row: the column names — Name, Maker, Range, Type, Finish, Colour, Pots in stock, Low below, Notes (any order; Name and Type are needed). A
          paint with the same name and maker as one on the rack is updated.
        </p>
      </div>
      <div>
        <Button onClick={send} loading={run.isPending}>
          <FileUp aria-hidden="true" className="size-4" />
          Import paints
        </Button>
      </div>
      {problem && <ErrorNote>{problem}</ErrorNote>}
      {report && <ImportResult report={report} />}
    </div>
  );
}

function ImportResult({ report }: { report: ImportReport }) {
  const nothing = report.created === 0 && report.updated === 0;
  return (
    <section aria-label="Import report" className="flex flex-col gap-3" aria-live="polite">
      <Note className={nothing ? 'border-oxide-600' : 'border-verdigris-600'}>
        <p className="font-semibold">
          {nothing ? 'No paint was imported.' : `${pluralize(report.created, 'paint')} added, ${pluralize(report.updated, 'paint')} updated.`}
          {report.skipped.length > 0 && ` ${pluralize(report.skipped.length, 'row')} left out.`}
        </p>
        {report.notes.map((n) => (
          <p key={n}>{n}</p>
        ))}
      </Note>
      {report.skipped.length > 0 && (
        <div>
          <h3 className="mb-1 text-sm font-semibold">Rows left out — fix them in the file and import it again</h3>
          <ul className="flex flex-col divide-y divide-primer-300 rounded-card border border-primer-300 bg-bone-50 text-sm">
            {report.skipped.map((s) => (
              <li key={`${s.line}-${s.message}`} className="flex gap-3 px-3 py-2">
                <span className="figures w-16 shrink-0 font-medium">Line {s.line}</span>
                <span>{s.message}</span>
              </li>
            ))}
          </ul>
        </div>
      )}
    </section>
  );
}
