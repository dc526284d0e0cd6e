import { Panel } from '@/components/ui/panel';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useAssignment } from '@/features/assignment/api/get-assignment';
import { SchemeForm } from '@/features/assignment/components/scheme-form';
import { SchemeSummary } from '@/features/assignment/components/scheme-summary';
import type { SchemeContext } from '@/features/assignment/utils/scheme-settings';
import { useConditions } from '@/features/study-design/api/get-conditions';
import { useStratificationFactors } from '@/features/study-design/api/get-stratification-factors';
import { ConditionsSection } from '@/features/study-design/components/conditions-section';
import type { DesignLock, SetupPermissions } from '@/features/study-design/components/design-lock';
import { FactorsSection } from '@/features/study-design/components/factors-section';
import { LockNotice } from '@/features/study-design/components/lock-notice';
import { ScreeningSection } from '@/features/study-design/components/screening-section';
import { ReturnLinkPanel } from '@/features/study-design/components/return-link-panel';
import { StepsSection } from '@/features/study-design/components/steps-section';
import { ReminderPlanSection } from '@/features/reminders/components/reminder-plan-section';
import { StudyMembersPanel } from '@/features/membership/components/study-members-panel';
import { OpeningChecklistPanel } from '@/features/studies/components/opening-checklist';
import type { Study } from '@/features/studies/api/get-study';
import { ApiError } from '@/lib/api-error';
import type { Role } from '@/lib/role-access';
import { mayDesignStudy, mayOverridePay } from '@/lib/study-permissions';
import { useStudySession } from '../../study-context';

const sections = [
  { id: 'conditions', label: 'Conditions' },
  { id: 'steps', label: 'Steps and pay' },
  { id: 'return-link', label: 'Return address' },
  { id: 'reminders', label: 'Reminders' },
  { id: 'factors', label: 'Stratification factors' },
  { id: 'screening', label: 'Screening questions' },
  { id: 'scheme', label: 'Assignment scheme' },
  { id: 'members', label: 'Members' },
];

function permissionsFor(study: Study, role: Role): SetupPermissions {
  const closed: DesignLock = study.status === 'closed' ? 'closed' : null;
  const byRole: DesignLock = mayDesignStudy(role) ? null : 'role';
  const content = closed ?? byRole;
  return {
    content,
    design: content ?? (study.designLocked ? 'assigned' : null),
    payOverrides: content ?? (mayOverridePay(role) ? null : 'role'),
    resealsOnChange: study.status !== 'draft' && study.status !== 'closed' && !study.designLocked,
  };
}

export function Component() {
  const { study, me } = useStudySession();
  const permissions = permissionsFor(study, me.role);

  return (
    <div className="flex flex-col gap-5">
      <title>{`Set-up · ${study.title} · Evenhand`}</title>
      <nav aria-label="Set-up sections" className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
        {sections.map((section) => (
          <a key={section.id} href={`#${section.id}`} className="text-spruce-ink underline-offset-2 hover:underline">
            {section.label}
          </a>
        ))}
      </nav>
      {(study.status === 'draft' || study.status === 'paused') && mayDesignStudy(me.role) && (
        <OpeningChecklistPanel studyId={study.id} />
      )}
      <ConditionsSection
        studyId={study.id}
        design={study.design}
        blinded={study.blinded}
        isDraft={study.status === 'draft'}
        permissions={permissions}
      />
      <StepsSection studyId={study.id} design={study.design} permissions={permissions} />
      <ReturnLinkPanel studyId={study.id} canRotate={permissions.content === null} />
      <ReminderPlanSection studyId={study.id} canEdit={permissions.content === null} />
      <FactorsSection studyId={study.id} permissions={permissions} />
      <ScreeningSection studyId={study.id} permissions={permissions} />
      <SchemeSection study={study} permissions={permissions} />
      <StudyMembersPanel studyId={study.id} studyTitle={study.title} canManage={me.role === 'admin'} />
    </div>
  );
}

function SchemeSection({ study, permissions }: { study: Study; permissions: SetupPermissions }) {
  const assignment = useAssignment(study.id);
  const conditions = useConditions(study.id);
  const factors = useStratificationFactors(study.id);
  const failed = [assignment, conditions, factors].find((query) => query.isError);

  const body = () => {
    if (failed) {
      return (
        <ErrorState
          message={
            failed.error instanceof ApiError ? failed.error.message : 'The assignment scheme could not be loaded.'
          }
          onRetry={() => [assignment, conditions, factors].forEach((query) => void query.refetch())}
        />
      );
    }
    if (!assignment.data || !conditions.data || !factors.data) return <LoadingState label="Loading the scheme…" />;
    if (permissions.design !== null) {
      return (
        <>
          <LockNotice lock={permissions.design} />
          <SchemeSummary method={assignment.data.method} settings={assignment.data.settings} />
        </>
      );
    }
    const context: SchemeContext = {
      design: study.design,
      conditionWeights: conditions.data.map((condition) => condition.allocationWeight),
      factors: factors.data.items.map((factor) => ({ key: factor.key, kind: factor.kind })),
    };
    return (
      <SchemeForm
        // A change to the design (a new condition or factor) starts the form again from what is saved.
        key={`${context.conditionWeights.join(',')}-${factors.data.items.map((f) => f.key).join(',')}`}
        studyId={study.id}
        context={context}
        savedMethod={assignment.data.method}
        savedSettings={assignment.data.settings}
        resealsOnSave={permissions.resealsOnChange}
        dryRunPath={`/studies/${study.id}/assignment#dry-run`}
      />
    );
  };

  return (
    <Panel
      id="scheme"
      title="Assignment scheme"
      description={
        study.design === 'between'
          ? 'How Evenhand decides, at the moment a participant signs, which condition they are in. Assigning by a pretest cut-off is deliberately not offered.'
          : 'How Evenhand decides, at the moment a participant signs, the order in which they go through the conditions.'
      }
    >
      {body()}
    </Panel>
  );
}
