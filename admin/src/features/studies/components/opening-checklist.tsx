import { Link } from 'react-router-dom';
import { Panel } from '@/components/ui/panel';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { ApiError } from '@/lib/api-error';
import { useOpeningChecklist } from '../api/get-opening-checklist';
import { openingRequirementPlaces } from '../utils/opening-requirements';

export interface OpeningChecklistPanelProps {
  studyId: string;
  /** Relative to the study, e.g. "setup#steps"; absent items are shown without a link. */
  hrefFor?: (place: string) => string;
}

/** What the study still needs before “Open study” can succeed, each item met or with what is missing. */
export function OpeningChecklistPanel({
  studyId,
  hrefFor = (place) => `/studies/${studyId}/${place}`,
}: OpeningChecklistPanelProps) {
  const checklist = useOpeningChecklist(studyId);
  return (
    <Panel
      id="opening-checklist"
      title="Before the study opens"
      description={
        checklist.data?.ready
          ? 'Everything is in place: “Open study” above seals the assignment sequence and lets participants join.'
          : '“Open study” above works once each of these is done.'
      }
    >
      {checklist.isPending ? (
        <LoadingState label="Checking what the study still needs…" />
      ) : checklist.isError ? (
        <ErrorState
          message={
            checklist.error instanceof ApiError ? checklist.error.message : 'The opening checklist could not be loaded.'
          }
          onRetry={() => void checklist.refetch()}
        />
      ) : (
        <ul className="flex flex-col gap-2 text-sm" aria-label="Opening checklist">
          {checklist.data.items.map((item) => {
            const place = openingRequirementPlaces[item.key];
            return (
              <li key={item.key} className="flex items-start gap-2.5">
                <span
                  aria-hidden="true"
                  className={`mt-0.5 flex size-4 shrink-0 items-center justify-center rounded-full text-2xs font-bold ${item.met ? 'bg-success-soft text-success' : 'bg-caution-soft text-caution'}`}
                >
                  {item.met ? '✓' : '!'}
                </span>
                <span className="flex flex-col">
                  <span className="font-medium text-ink">
                    {item.label}
                    <span className="sr-only">{item.met ? ': done' : ': still needed'}</span>
                  </span>
                  {!item.met && (
                    <span className="text-ink-muted">
                      {item.detail ?? 'Still needed.'}
                      {place && (
                        <>
                          {' '}
                          <Link
                            to={hrefFor(place)}
                            className="font-medium text-spruce-ink underline underline-offset-2"
                          >
                            Go there
                            <span className="sr-only"> ({item.label})</span>
                          </Link>
                        </>
                      )}
                    </span>
                  )}
                </span>
              </li>
            );
          })}
        </ul>
      )}
    </Panel>
  );
}
