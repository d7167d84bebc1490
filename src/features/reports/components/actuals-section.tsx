import type { ActualsReport } from '../../../../shared/schemas/reports';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Table, TBody, Td, Th, THead, Tr } from '../../../components/ui/table';
import { useToast } from '../../../components/ui/toast';
import { useAcceptSuggestion } from '../api/accept-suggestion';
import { hoursText, percent } from './months';

const rate = (r: number) => new Intl.NumberFormat(undefined, { minimumFractionDigits: 2, maximumFractionDigits: 2 }).format(r);

function LearningRate({ lr }: { lr: ActualsReport['learningRate'] }) {
  const f = lr.fitted;
  return (
    <Card
      title="Batch learning rate"
      description="How much faster each figure goes when identical figures are painted together: at 0.90, doubling a batch takes each figure to 90 % of its time. Fitted by least squares on the logarithm of the logged time against the logarithm of the batch size (Wright’s learning curve, as the quotes use)."
    >
      <dl className="grid gap-2 sm:grid-cols-2">
        <div className="rounded-control border border-primer-300 bg-white px-3 py-2">
          <dt className="text-xs text-sable-600">From your logged batches</dt>
          <dd className="figures text-2xl font-semibold">{f ? rate(f.rate) : '—'}</dd>
          <dd className="text-xs text-sable-600">
            {f
              ? `${lr.batches} figure lines in ${f.quantities} batch sizes · fit r² ${rate(f.r2)}${f.rate > 1 ? ' · bigger batches took longer per figure' : ''}${f.rate < 0.5 ? ' · outside what the price table accepts (0.5–1)' : ''}`
              : 'Needs logged time on done stages of at least two batch sizes (large figures are left out: they are quoted apart).'}
          </dd>
        </div>
        <div className="rounded-control border border-primer-300 bg-white px-3 py-2">
          <dt className="text-xs text-sable-600">In the price table</dt>
          <dd className="figures text-2xl font-semibold">{rate(lr.table)}</dd>
          <dd className="text-xs text-sable-600">Change it on the price table page if your batches say otherwise.</dd>
        </div>
      </dl>
    </Card>
  );
}

function Suggestions({ studioId, report }: { studioId: number; report: ActualsReport }) {
  const accept = useAcceptSuggestion(studioId);
  const toast = useToast();
  return (
    <Card
      title="Suggested price-table changes"
      description="Cells where the median of at least three done stages differs from the table by 10 % or more. Each is the hours for ONE figure (batches converted with the table’s learning rate, extras taken off). Accept the ones you agree with, one by one."
    >
      {report.suggestions.length === 0 ? (
        <p className="text-sm text-sable-600">No suggestions: your logged time agrees with the table, or there is not enough of it yet.</p>
      ) : (
        <Table caption="Suggested changes to the hours for one figure" captionHidden className="relative">
          <THead>
            <Tr>
              <Th>Size and tier</Th>
              <Th>Stage</Th>
              <Th className="text-right">Table</Th>
              <Th className="text-right">Logged (median)</Th>
              <Th className="text-right">Done stages</Th>
              <Th>
                <span className="sr-only">Accept</span>
              </Th>
            </Tr>
          </THead>
          <TBody>
            {report.suggestions.map((s) => {
              const key = `${s.sizeClass}/${s.tier}/${s.stage}`;
              const busy = accept.isPending && accept.variables && `${accept.variables.sizeClass}/${accept.variables.tier}/${accept.variables.stage}` === key;
              return (
                <Tr key={key}>
                  <Td>
                    {s.sizeLabel} · {s.tierLabel}
                  </Td>
                  <Td>{s.stageLabel}</Td>
                  <Td className="figures text-right">{hoursText(s.tableHours)}</Td>
                  <Td className="figures text-right">
                    {hoursText(s.medianHours)} <Badge tone={s.change !== null && s.change > 0 ? 'attention' : 'neutral'}>{percent(s.change)}</Badge>
                  </Td>
                  <Td className="figures text-right">{s.count}</Td>
                  <Td className="text-right">
                    <Button
                      size="sm"
                      variant="secondary"
                      loading={Boolean(busy)}
                      disabled={accept.isPending}
                      aria-label={`Use ${hoursText(s.suggestedHours)} for ${s.stageLabel}, ${s.sizeLabel} ${s.tierLabel}`}
                      onClick={() =>
                        accept.mutate(
                          { sizeClass: s.sizeClass, tier: s.tier, stage: s.stage, hours: s.suggestedHours },
                          {
                            onSuccess: () => toast.show(`Price table: ${s.stageLabel}, ${s.sizeLabel} ${s.tierLabel} is now ${hoursText(s.suggestedHours)} a figure.`),
                            onError: (err) => toast.show(err.message, 'error'),
                          },
                        )
                      }
                    >
                      Use {hoursText(s.suggestedHours)}
                    </Button>
                  </Td>
                </Tr>
              );
            })}
          </TBody>
        </Table>
      )}
    </Card>
  );
}

/** Logged against estimated hours, the medians behind the table's cells, suggestions and the batch rate. */
export function ActualsSection({ studioId, report }: { studioId: number; report: ActualsReport }) {
  return (
    <>
      <Card
        title="Logged against estimated hours"
        description={`${report.doneStages} done stages with time logged${report.doneWithoutTime ? `; ${report.doneWithoutTime} done without any time, left out` : ''}. Estimates are the stages’ own, from the accepted quotes.`}
      >
        <dl className="mb-4 flex flex-wrap gap-x-6 gap-y-1 text-sm">
          <div>
            <dt className="inline text-sable-600">Estimated </dt>
            <dd className="figures inline font-semibold">{hoursText(report.totals.estimatedHours)}</dd>
          </div>
          <div>
            <dt className="inline text-sable-600">Logged </dt>
            <dd className="figures inline font-semibold">{hoursText(report.totals.loggedHours)}</dd>
          </div>
          <div>
            <dt className="inline text-sable-600">Difference </dt>
            <dd className="figures inline font-semibold">{percent(report.totals.difference)}</dd>
          </div>
        </dl>
        {report.byStage.length > 0 && (
          <Table caption="By stage" captionHidden className="relative">
            <THead>
              <Tr>
                <Th>Stage</Th>
                <Th className="text-right">Done</Th>
                <Th className="text-right">Estimated</Th>
                <Th className="text-right">Logged</Th>
                <Th className="text-right">Difference</Th>
              </Tr>
            </THead>
            <TBody>
              {report.byStage.map((s) => (
                <Tr key={s.key}>
                  <Td>{s.name}</Td>
                  <Td className="figures text-right">{s.count}</Td>
                  <Td className="figures text-right">{hoursText(s.estimatedHours)}</Td>
                  <Td className="figures text-right">{hoursText(s.loggedHours)}</Td>
                  <Td className="figures text-right">{percent(s.difference)}</Td>
                </Tr>
              ))}
            </TBody>
          </Table>
        )}
      </Card>
      <LearningRate lr={report.learningRate} />
      <Suggestions studioId={studioId} report={report} />
      <Card title="Median hours for one figure" description="Per size class, tier and stage, with the number of done stages behind each median.">
        {report.cells.length === 0 ? (
          <p className="text-sm text-sable-600">Nothing logged on done stages yet.</p>
        ) : (
          <details>
            <summary className="cursor-pointer text-sm font-medium text-verdigris-600">Show all {report.cells.length} cells</summary>
            <Table caption="Median logged hours for one figure" captionHidden className="relative mt-3">
              <THead>
                <Tr>
                  <Th>Size</Th>
                  <Th>Tier</Th>
                  <Th>Stage</Th>
                  <Th className="text-right">Median</Th>
                  <Th className="text-right">Done stages</Th>
                  <Th className="text-right">Table</Th>
                </Tr>
              </THead>
              <TBody>
                {report.cells.map((c) => (
                  <Tr key={`${c.sizeClass}/${c.tier}/${c.stage}`}>
                    <Td>{c.sizeLabel}</Td>
                    <Td>{c.tierLabel}</Td>
                    <Td>{c.stageLabel}</Td>
                    <Td className="figures text-right">{hoursText(c.medianHours)}</Td>
                    <Td className="figures text-right">{c.count}</Td>
                    <Td className="figures text-right">{c.tableHours === null ? '—' : hoursText(c.tableHours)}</Td>
                  </Tr>
                ))}
              </TBody>
            </Table>
          </details>
        )}
      </Card>
    </>
  );
}
