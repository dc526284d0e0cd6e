import { useMemo } from 'react';
import { Button } from '@/components/ui/button';
import { cx } from '@/components/ui/cx';
import { Pager } from '@/components/ui/pager';
import { Panel } from '@/components/ui/panel';
import { buttonRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { useLatestSearchParams } from '@/hooks/use-latest-search-params';
import { ApiError } from '@/lib/api-error';
import { parsePageParam } from '@/lib/paging';
import { useAuditEvents } from '../api/get-audit-events';
import { useAuditFilters } from '../api/get-audit-filters';
import { exportHref, isFiltered, selectionFromParams, type AuditSelection } from '../utils/audit-selection';
import { AuditEventList } from './audit-event-list';
import { AuditFilters } from './audit-filters';
import { AuditReceipts } from './audit-receipts';
import { IntegrityCheck } from './integrity-check';

const pageSize = 50;

export interface AuditTrailProps {
  /** Auditors and admins may seal a receipt on request (the api's rule). */
  canSeal: boolean;
}

export function AuditTrail({ canSeal }: AuditTrailProps) {
  const [searchParams, updateSearchParams] = useLatestSearchParams();
  const selection = useMemo(() => selectionFromParams(searchParams), [searchParams]);
  const page = parsePageParam(searchParams.get('page'));
  const events = useAuditEvents(selection, page, pageSize);
  const filters = useAuditFilters();
  const studyTitles = useMemo(
    () => new Map((filters.data?.studies ?? []).map((study) => [study.id, study.title])),
    [filters.data],
  );
  const familyLabels = useMemo(
    () => new Map((filters.data?.families ?? []).map((family) => [family.key as string, family.label])),
    [filters.data],
  );

  // Each change starts from the newest address, so quick clicks in a row all count.
  const select = (change: (current: AuditSelection) => AuditSelection) =>
    updateSearchParams(
      (current) => {
        const next = change(selectionFromParams(current));
        const params = new URLSearchParams();
        if (next.chain) params.set('chain', next.chain);
        if (next.participant) params.set('participant', next.participant);
        if (next.staff) params.set('staff', next.staff);
        if (next.from) params.set('from', next.from);
        if (next.to) params.set('to', next.to);
        for (const family of next.families) params.append('family', family);
        return params;
      },
      { replace: true },
    );
  const goToPage = (next: number) =>
    updateSearchParams((current) => {
      const copy = new URLSearchParams(current);
      if (next > 1) copy.set('page', String(next));
      else copy.delete('page');
      return copy;
    });
  const filtered = isFiltered(selection);

  return (
    <div className="flex flex-col gap-5">
      <div className="grid gap-4 lg:grid-cols-2">
        <Panel id="integrity" title="Is the trail as it was written?">
          <IntegrityCheck
            studyTitles={studyTitles}
            onShowChain={(chain) => select((current) => ({ ...current, chain }))}
          />
        </Panel>
        <Panel id="receipts" title="Audit receipts">
          <AuditReceipts canSeal={canSeal} />
        </Panel>
      </div>

      <section aria-labelledby="events-heading" className="flex flex-col gap-3">
        <div className="flex flex-wrap items-end justify-between gap-2">
          <h2 id="events-heading" className="text-lg font-semibold">
            What happened
          </h2>
          <div className="flex flex-wrap items-center gap-2">
            {filtered && (
              <Button onClick={() => updateSearchParams(() => new URLSearchParams(), { replace: true })}>
                Clear filters
              </Button>
            )}
            <a
              href={exportHref('/api/audit/export.csv', selection)}
              download
              className={cx(buttonRecipe.base, buttonRecipe.sizes.regular, buttonRecipe.variants.primary)}
            >
              Export as CSV
            </a>
            <a
              href={exportHref('/api/audit/export-summary.txt', selection)}
              download
              className={cx(buttonRecipe.base, buttonRecipe.sizes.regular, buttonRecipe.variants.secondary)}
            >
              Verification summary
            </a>
          </div>
        </div>
        <AuditFilters selection={selection} options={filters.data} onChange={select} />
        <p className="text-xs text-ink-muted">
          The export holds every event of this selection (not only this page); the summary names the file’s SHA-256 and
          the receipt it was checked against.
        </p>

        {events.isPending ? (
          <LoadingState label="Loading the audit trail…" />
        ) : events.isError ? (
          <ErrorState
            message={events.error instanceof ApiError ? events.error.message : 'The audit trail could not be loaded.'}
            onRetry={() => void events.refetch()}
          />
        ) : events.data.items.length === 0 ? (
          page > 1 ? (
            <EmptyState
              title={`Page ${page} is empty`}
              action={<Button onClick={() => goToPage(1)}>Go to the first page</Button>}
            >
              The list is shorter than this page.
            </EmptyState>
          ) : (
            <EmptyState title={filtered ? 'Nothing matches' : 'Nothing recorded yet'}>
              {filtered
                ? 'No event fits every filter. Widen the dates, tick more kinds of action, or check the participant reference.'
                : 'Events appear here from the first sign-in.'}
            </EmptyState>
          )
        ) : (
          <>
            <AuditEventList events={events.data.items} familyLabels={familyLabels} busy={events.isFetching} />
            <Pager
              label="Audit trail pages"
              noun={['event', 'events']}
              pageSize={pageSize}
              total={events.data.total}
              page={page}
              onPage={goToPage}
            />
          </>
        )}
      </section>
    </div>
  );
}
