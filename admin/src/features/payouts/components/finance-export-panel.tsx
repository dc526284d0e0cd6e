import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/panel';
import { Notice } from '@/components/ui/states';
import { TextField } from '@/components/ui/text-field';
import { ApiError } from '@/lib/api-error';
import { useDownloadFinanceExport } from '../api/download-finance-export';
import { periodProblems, thisMonth } from '../utils/finance-period';

/** The finance office's file: what each participant was paid in a period, with their year's total and the threshold. */
export function FinanceExportPanel({ studyId }: { studyId: string }) {
  const [period, setPeriod] = useState(() => thisMonth(new Date()));
  const [shown, setShown] = useState(false);
  const download = useDownloadFinanceExport(studyId);
  const problems = periodProblems(period);
  const submit = (event: React.FormEvent) => {
    event.preventDefault();
    setShown(true);
    if (problems.from || problems.to) return;
    download.mutate(period);
  };
  return (
    <Panel
      id="finance-export"
      title="Payments for the finance office"
      description="One row per participant paid in the period: the amount, their total this calendar year across studies, and the tax-reporting threshold. A spreadsheet-ready CSV."
    >
      <form noValidate onSubmit={submit} className="flex flex-col gap-3">
        <div className="flex flex-wrap items-start gap-3">
          <TextField
            label="First day"
            type="date"
            className="w-44"
            value={period.from}
            onChange={(event) => setPeriod({ ...period, from: event.target.value })}
            error={shown ? problems.from : undefined}
          />
          <TextField
            label="Last day"
            type="date"
            className="w-44"
            value={period.to}
            onChange={(event) => setPeriod({ ...period, to: event.target.value })}
            error={shown ? problems.to : undefined}
          />
          <Button type="submit" className="mt-5" pending={download.isPending}>
            Download CSV
          </Button>
        </div>
        {download.isSuccess && <Notice tone="info">Saved {download.data}.</Notice>}
        {download.isError && (
          <Notice tone="danger">
            {download.error instanceof ApiError ? download.error.message : 'The file could not be made. Try again.'}
          </Notice>
        )}
        <p className="text-xs text-ink-muted">
          Amounts appear in currency units and in minor units (cents). How research payments are taxed and reported is
          for your institution’s finance office to decide; the threshold column is a screening aid, not advice.
        </p>
      </form>
    </Panel>
  );
}
