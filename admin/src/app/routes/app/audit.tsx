import { useMemo } from 'react';
import { EmptyState } from '@/components/ui/states';
import { AuditTrail } from '@/features/audit/components/audit-trail';
import { useStudies } from '@/features/studies/api/get-studies';
import type { Role } from '@/lib/role-access';
import { useStaffSession } from '../../session-context';

// The api's @Roles on /api/audit (audit.controller.ts).
const auditReaders: readonly Role[] = ['auditor', 'admin'];

export function Component() {
  const { me } = useStaffSession();
  const allowed = auditReaders.includes(me.role);
  return (
    <>
      <title>Audit trail · Evenhand</title>
      {allowed ? (
        <AuditPage />
      ) : (
        <EmptyState title="Not part of your role">
          The audit trail is for auditors and lab admins. If you need it for your work, ask a lab admin to change your role.
        </EmptyState>
      )}
    </>
  );
}

function AuditPage() {
  const studies = useStudies();
  // Without study titles the chains are named by id; the trail itself does not depend on them.
  const studyTitles = useMemo(() => new Map((studies.data?.items ?? []).map((study) => [study.id, study.title])), [studies.data]);
  return (
    <section aria-labelledby="audit-heading" className="flex flex-col gap-4">
      <div>
        <h1 id="audit-heading" className="text-xl font-semibold">
          Audit trail
        </h1>
        <p className="text-sm text-ink-muted">
          Every sign-in, consent signature and change, in an append-only log with one hash chain per study and one for the lab.
        </p>
      </div>
      <AuditTrail studyTitles={studyTitles} />
    </section>
  );
}
