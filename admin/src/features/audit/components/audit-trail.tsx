import { Field, Label, Select } from '@headlessui/react';
import { useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { Pager } from '@/components/ui/pager';
import { Panel } from '@/components/ui/panel';
import { fieldRecipe, inputRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { cx } from '@/components/ui/cx';
import { ApiError } from '@/lib/api-error';
import { parsePageParam } from '@/lib/paging';
import { useAuditEvents } from '../api/get-audit-events';
import { auditActionGroups, auditActionLabel, chainLabel, labChain } from '../utils/audit-labels';
import { AuditEventsTable } from './audit-events-table';
import { IntegrityCheck } from './integrity-check';

const pageSize = 50;
const selectClass = cx(inputRecipe, 'pr-8');

export interface AuditTrailProps {
  /** Study id → title, to name each study's chain. */
  studyTitles: ReadonlyMap<string, string>;
}

export function AuditTrail({ studyTitles }: AuditTrailProps) {
  const [searchParams, setSearchParams] = useSearchParams();
  const chain = searchParams.get('chain');
  const action = searchParams.get('action');
  const page = parsePageParam(searchParams.get('page'));
  const events = useAuditEvents({ chain, action, page, pageSize });

  const setParam = (name: 'chain' | 'action' | 'page', value: string | null) =>
    setSearchParams(
      (params) => {
        const next = new URLSearchParams(params);
        if (value) next.set(name, value);
        else next.delete(name);
        if (name !== 'page') next.delete('page');
        return next;
      },
      { replace: name !== 'page' },
    );

  const knownAction = action === null || auditActionGroups.some((group) => group.actions.some((entry) => entry.action === action));

  return (
    <div className="flex flex-col gap-5">
      <Panel id="integrity" title="Integrity check" description="Proves that no event was changed, removed or slipped in after it was written.">
        <IntegrityCheck studyTitles={studyTitles} onShowChain={(next) => setParam('chain', next)} />
      </Panel>

      <section aria-labelledby="events-heading" className="flex flex-col gap-3">
        <h2 id="events-heading" className="text-lg font-semibold">
          Events
        </h2>
        <div className="flex flex-wrap items-end gap-3">
          <Field className={cx(fieldRecipe.field, 'w-60')}>
            <Label className={fieldRecipe.label}>Chain</Label>
            <Select value={chain ?? ''} onChange={(event) => setParam('chain', event.target.value || null)} className={selectClass}>
              <option value="">All chains</option>
              <option value={labChain}>Lab-wide</option>
              {[...studyTitles].map(([id, title]) => (
                <option key={id} value={id}>
                  {title}
                </option>
              ))}
              {chain && chain !== labChain && !studyTitles.has(chain) && <option value={chain}>{chainLabel(chain, studyTitles)}</option>}
            </Select>
          </Field>
          <Field className={cx(fieldRecipe.field, 'w-72')}>
            <Label className={fieldRecipe.label}>Action</Label>
            <Select value={action ?? ''} onChange={(event) => setParam('action', event.target.value || null)} className={selectClass}>
              <option value="">All actions</option>
              {auditActionGroups.map((group) => (
                <optgroup key={group.group} label={group.group}>
                  {group.actions.map((entry) => (
                    <option key={entry.action} value={entry.action}>
                      {entry.label}
                    </option>
                  ))}
                </optgroup>
              ))}
              {!knownAction && action && <option value={action}>{auditActionLabel(action)}</option>}
            </Select>
          </Field>
          {(chain || action) && (
            <Button onClick={() => setSearchParams({}, { replace: true })}>Clear filters</Button>
          )}
          {events.isFetching && !events.isPending && <span className="pb-2 text-xs text-ink-faint">Updating…</span>}
        </div>

        {events.isPending ? (
          <LoadingState label="Loading the audit trail…" />
        ) : events.isError ? (
          <ErrorState
            message={events.error instanceof ApiError ? events.error.message : 'The audit trail could not be loaded.'}
            onRetry={() => void events.refetch()}
          />
        ) : events.data.items.length === 0 ? (
          page > 1 ? (
            <EmptyState title={`Page ${page} is empty`} action={<Button onClick={() => setParam('page', null)}>Go to the first page</Button>}>
              The list is shorter than this page.
            </EmptyState>
          ) : (
            <EmptyState title={chain || action ? 'No events match' : 'No events recorded yet'}>
              {chain || action ? 'No event in this chain has this action. Choose another chain or action.' : 'Events appear here from the first sign-in.'}
            </EmptyState>
          )
        ) : (
          <>
            <AuditEventsTable events={events.data.items} studyTitles={studyTitles} busy={events.isFetching} />
            <Pager label="Audit trail pages" noun={['event', 'events']} pageSize={pageSize} total={events.data.total} page={page} onPage={(next) => setParam('page', next > 1 ? String(next) : null)} />
          </>
        )}
      </section>
    </div>
  );
}
