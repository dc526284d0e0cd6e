import { Badge } from '@/components/ui/badge';
import { Panel } from '@/components/ui/panel';
import { tableRecipe } from '@/components/ui/recipes';
import { ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { formatMinor } from '@/lib/money';
import { useTaxThreshold } from '../api/get-tax-threshold';

export function TaxThresholdPanel({ studyId }: { studyId: string }) {
  const tax = useTaxThreshold(studyId);
  return (
    <Panel
      id="tax-threshold"
      title="Tax reporting threshold"
      description="People paid through this study whose total this calendar year is near or over the reporting threshold."
    >
      {tax.isPending ? (
        <LoadingState label="Loading year-to-date totals…" className="py-4" />
      ) : tax.isError ? (
        <ErrorState
          message={tax.error instanceof ApiError ? tax.error.message : 'The totals could not be loaded.'}
          onRetry={() => void tax.refetch()}
        />
      ) : (
        <div className="flex flex-col gap-3">
          <Notice tone="caution">
            {tax.data.caution} Your institution's finance office decides what must be reported.
          </Notice>
          {(() => {
            const flagged = tax.data.participants.filter((entry) => entry.standing !== 'under');
            const threshold = formatMinor(tax.data.thresholdMinor, tax.data.currency, 'en-US');
            if (flagged.length === 0)
              return (
                <p className="text-sm text-ink-muted">
                  Nobody is near the {threshold} threshold for {tax.data.year}.
                </p>
              );
            return (
              <div className={tableRecipe.frame}>
                <table className={tableRecipe.table}>
                  <caption className="sr-only">
                    People near or over the {threshold} threshold in {tax.data.year}
                  </caption>
                  <thead>
                    <tr>
                      <th scope="col" className={tableRecipe.headCell}>
                        Participant
                      </th>
                      <th scope="col" className={tableRecipe.headCell}>
                        Paid in {tax.data.year}
                      </th>
                      <th scope="col" className={tableRecipe.headCell}>
                        Against {threshold}
                      </th>
                    </tr>
                  </thead>
                  <tbody>
                    {flagged.map((entry) => (
                      <tr key={entry.participantId} className={tableRecipe.row}>
                        <td className={tableRecipe.cell}>{entry.email}</td>
                        <td className={`${tableRecipe.cell} tabular-nums`}>
                          {formatMinor(entry.paidThisYearMinor, tax.data.currency, 'en-US')}
                        </td>
                        <td className={tableRecipe.cell}>
                          {entry.standing === 'over' ? (
                            <Badge tone="danger">Over</Badge>
                          ) : (
                            <Badge tone="caution">Near</Badge>
                          )}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            );
          })()}
        </div>
      )}
    </Panel>
  );
}
