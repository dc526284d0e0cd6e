import { Input } from '@headlessui/react';
import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Pager } from '@/components/ui/pager';
import { inputRecipe } from '@/components/ui/recipes';
import { EmptyState, ErrorState, LoadingState, Notice } from '@/components/ui/states';
import { useUrlSearch } from '@/hooks/use-url-search';
import { ApiError } from '@/lib/api-error';
import type { ParticipationChange } from '../api/change-participation';
import { useReconsentCount, useRoster, type EnrollmentStatus, type RosterEntry } from '../api/get-roster';
import { BulkCompletionDialog, type ListableStep } from './bulk-completion-dialog';
import { enrollmentStatusLabels, enrollmentStatusOrder } from './enrollment-status-badge';
import { ImportRosterDialog } from './import-roster-dialog';
import {
  changeAnnouncement,
  ParticipationChangeDialog,
  type ParticipationChangeTarget,
} from './participation-change-dialog';
import { RosterMailDialog, type RosterMailing } from './roster-mail-dialog';
import { RosterTable } from './roster-table';
import { StatusFilter } from './status-filter';

const pageSize = 25;

function parseStatus(value: string | null): EnrollmentStatus | null {
  return enrollmentStatusOrder.find((status) => status === value) ?? null;
}

export interface RosterProps {
  studyId: string;
  /** While blinded the api sends condition codes only; the column says so. */
  blinded: boolean;
  /** Coordinators and admins import, invite, remind and record changes (the api's rule). */
  canManage: boolean;
  recordHref: (enrollmentId: string) => string;
  factorKeys?: readonly string[];
  /** The study's steps, for marking one done for a list of people. */
  steps?: readonly ListableStep[];
  /** Coordinators, researchers and admins may download every participant's codes. */
  canDownloadCodes?: boolean;
}

export function Roster({
  studyId,
  blinded,
  canManage,
  recordHref,
  factorKeys,
  steps = [],
  canDownloadCodes = false,
}: RosterProps) {
  const { searchParams, setSearchParams, search, page, searchText, setSearchText, goToPage } = useUrlSearch();
  const status = parseStatus(searchParams.get('status'));
  const needsReconsent = searchParams.get('reconsent') === '1';
  const [importKey, setImportKey] = useState(0);
  const [importing, setImporting] = useState(false);
  const [listKey, setListKey] = useState(0);
  const [markingList, setMarkingList] = useState(false);
  const [mailing, setMailing] = useState<RosterMailing | null>(null);
  const [change, setChange] = useState<ParticipationChangeTarget | null>(null);
  const [announcement, setAnnouncement] = useState<string | null>(null);

  // A filter change starts again from page 1 and replaces the history entry, as a new search does.
  const setParams = (changes: Record<string, string | null>) =>
    setSearchParams(
      (params) => {
        const next = new URLSearchParams(params);
        for (const [name, value] of Object.entries(changes)) {
          if (value === null) next.delete(name);
          else next.set(name, value);
        }
        next.delete('page');
        return next;
      },
      { replace: true },
    );

  const roster = useRoster(studyId, { status, needsReconsent, search, page, pageSize });
  const reconsentCount = useReconsentCount(studyId);
  const filtered = status !== null || needsReconsent || search !== '';

  const announce = (text: string) => setAnnouncement(text);
  const onChanged = (entry: RosterEntry, kind: ParticipationChange) => {
    setChange(null);
    announce(changeAnnouncement(entry, kind));
  };

  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 className="text-lg font-semibold">Roster</h2>
          <p className="text-sm text-ink-muted">
            Everyone invited to or enrolled in this study. Records are never deleted.
          </p>
        </div>
        {(canManage || canDownloadCodes) && (
          <div className="flex flex-wrap gap-2">
            {canDownloadCodes && (
              <a
                href={`/api/studies/${studyId}/step-codes.csv`}
                download
                className="inline-flex h-8 items-center rounded-md border border-line-strong bg-surface px-3 text-sm font-medium text-ink hover:bg-sunken focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-spruce"
              >
                Download everyone’s codes (CSV)
              </a>
            )}
            {canManage && (
              <Button
                onClick={() => {
                  setListKey((key) => key + 1);
                  setMarkingList(true);
                }}
              >
                Mark a step done for a list…
              </Button>
            )}
            {canManage && (
              <>
                {(reconsentCount.data ?? 0) > 0 && (
                  <Button onClick={() => setMailing('reconsent-reminders')}>
                    Remind to re-consent ({reconsentCount.data})
                  </Button>
                )}
                <Button onClick={() => setMailing('invitations')}>Send invitations</Button>
                <Button
                  variant="primary"
                  onClick={() => {
                    setImportKey((key) => key + 1);
                    setImporting(true);
                  }}
                >
                  Import CSV…
                </Button>
              </>
            )}
          </div>
        )}
      </div>

      <div aria-live="polite" className="empty:hidden">
        {announcement && <Notice tone="info">{announcement}</Notice>}
      </div>

      <div className="flex flex-col gap-3">
        {roster.data && (
          <StatusFilter
            countsByStatus={roster.data.countsByStatus}
            status={status}
            onStatus={(next) => setParams({ status: next })}
            needsReconsent={needsReconsent}
            reconsentCount={reconsentCount.data}
            onNeedsReconsent={(on) => setParams({ reconsent: on ? '1' : null })}
          />
        )}
        <div className="flex flex-wrap items-center gap-3">
          <label className="w-full max-w-xs">
            <span className="sr-only">Search by e-mail, name or reference</span>
            <Input
              type="search"
              value={searchText}
              onChange={(event) => setSearchText(event.target.value)}
              placeholder="Search e-mail, name or reference"
              className={inputRecipe}
            />
          </label>
          {roster.isFetching && !roster.isPending && <span className="text-xs text-ink-faint">Updating…</span>}
        </div>
      </div>

      {roster.isPending ? (
        <LoadingState label="Loading the roster…" />
      ) : roster.isError ? (
        <ErrorState
          message={roster.error instanceof ApiError ? roster.error.message : 'The roster could not be loaded.'}
          onRetry={() => void roster.refetch()}
        />
      ) : roster.data.items.length === 0 ? (
        page > 1 ? (
          <EmptyState
            title={`Page ${page} is empty`}
            action={<Button onClick={() => goToPage(1)}>Go to the first page</Button>}
          >
            The list is shorter than it was.
          </EmptyState>
        ) : filtered ? (
          <EmptyState
            title="No one matches"
            action={
              <Button
                onClick={() => {
                  setSearchText('');
                  setParams({ status: null, reconsent: null, q: null });
                }}
              >
                Show everyone
              </Button>
            }
          >
            {[
              status && `nobody is ${enrollmentStatusLabels[status].label.toLowerCase()}`,
              needsReconsent && 'nobody still needs to re-consent',
              search && `no e-mail, name or reference contains “${search}”`,
            ]
              .filter(Boolean)
              .join(', or ')
              .replace(/^./, (first) => first.toUpperCase())}
            .
          </EmptyState>
        ) : (
          <EmptyState title="Nobody on the roster yet">
            {canManage
              ? 'Import a CSV of invitees, then send invitations. People who join from the study page appear here too.'
              : 'People appear here once they are imported or join from the study page.'}
          </EmptyState>
        )
      ) : (
        <>
          <RosterTable
            entries={roster.data.items}
            blinded={blinded}
            canManage={canManage}
            recordHref={recordHref}
            busy={roster.isFetching}
            onChange={(kind, entry) => {
              setAnnouncement(null);
              setChange({ change: kind, entry });
            }}
          />
          <Pager
            label="Roster pages"
            noun={['person', 'people']}
            pageSize={pageSize}
            total={roster.data.total}
            page={page}
            onPage={goToPage}
          />
        </>
      )}

      {canManage && (
        <>
          <BulkCompletionDialog
            key={`list-${listKey}`}
            studyId={studyId}
            steps={steps}
            open={markingList}
            onClose={() => setMarkingList(false)}
          />
          <ImportRosterDialog
            key={importKey}
            studyId={studyId}
            open={importing}
            onClose={() => setImporting(false)}
            factorKeys={factorKeys}
          />
          <RosterMailDialog
            studyId={studyId}
            mailing={mailing}
            reconsentCount={reconsentCount.data ?? 0}
            onClose={() => setMailing(null)}
            onSent={(kind, count) => {
              setMailing(null);
              announce(
                kind === 'invitations'
                  ? count === 0
                    ? 'Everyone on the roster already had an invitation; none was sent.'
                    : `${count} ${count === 1 ? 'invitation was' : 'invitations were'} sent.`
                  : `${count} ${count === 1 ? 'reminder was' : 'reminders were'} sent to sign the new consent version.`,
              );
            }}
          />
          <ParticipationChangeDialog
            studyId={studyId}
            target={change}
            onClose={() => setChange(null)}
            onChanged={onChanged}
          />
        </>
      )}
    </div>
  );
}
