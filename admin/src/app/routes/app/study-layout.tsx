import { NavLink, Outlet, useParams } from 'react-router-dom';
import { cx } from '@/components/ui/cx';
import { tabNavRecipe } from '@/components/ui/recipes';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useAssignment } from '@/features/assignment/api/get-assignment';
import { useStudy } from '@/features/studies/api/get-study';
import { StudyHeader } from '@/features/studies/components/study-header';
import { StudyLifecycleActions } from '@/features/studies/components/study-lifecycle-actions';
import { ApiError } from '@/lib/api-error';
import { mayDesignStudy } from '@/lib/study-permissions';
import { useStaffSession } from '../../session-context';
import type { StudySession } from '../../study-context';
import { RequireArea } from './require-area';

const tabs = [
  { to: 'setup', label: 'Set-up' },
  { to: 'assignment', label: 'Assignment' },
  { to: 'consent', label: 'Consent' },
  { to: 'roster', label: 'Roster' },
  { to: 'watch', label: 'Dropout watch' },
  { to: 'pay', label: 'Pay' },
] as const;

export function Component() {
  const { studyId = '' } = useParams();
  const session = useStaffSession();
  const study = useStudy(studyId);
  const assignment = useAssignment(studyId);

  return (
    <RequireArea area="studies">
      {study.isPending ? (
        <LoadingState label="Loading the study…" />
      ) : study.isError ? (
        <ErrorState
          title={
            study.error instanceof ApiError && (study.error.statusCode === 404 || study.error.statusCode === 403)
              ? 'Study not available'
              : undefined
          }
          message={
            study.error instanceof ApiError && (study.error.statusCode === 404 || study.error.statusCode === 403)
              ? 'There is no such study, or you are not one of its members. Ask a lab admin to add you to it.'
              : study.error instanceof ApiError
                ? study.error.message
                : 'The study could not be loaded.'
          }
          onRetry={() => void study.refetch()}
        />
      ) : (
        <div className="flex flex-col gap-5">
          <StudyHeader
            study={study.data}
            commitment={assignment.data?.commitment ?? null}
            actions={mayDesignStudy(session.me.role) ? <StudyLifecycleActions study={study.data} /> : undefined}
          />
          <nav aria-label="Study" className={tabNavRecipe.list}>
            {tabs.map((tab) => (
              <NavLink
                key={tab.to}
                to={tab.to}
                className={({ isActive }) =>
                  cx(tabNavRecipe.tab, isActive ? tabNavRecipe.active : tabNavRecipe.inactive)
                }
              >
                {tab.label}
              </NavLink>
            ))}
          </nav>
          <Outlet context={{ ...session, study: study.data } satisfies StudySession} />
        </div>
      )}
    </RequireArea>
  );
}
