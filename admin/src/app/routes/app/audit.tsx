import { EmptyState } from '@/components/ui/states';
import { AuditTrail } from '@/features/audit/components/audit-trail';
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
          The audit trail is for auditors and lab admins. If you need it for your work, ask a lab admin to change your
          role.
        </EmptyState>
      )}
    </>
  );
}

function AuditPage() {
  return (
    <section aria-labelledby="audit-heading" className="flex flex-col gap-4">
      <div>
        <h1 id="audit-heading" className="text-xl font-semibold">
          Audit trail
        </h1>
        <p className="max-w-prose text-sm text-ink-muted">
          Everything people and Evenhand did, in plain sentences, newest first: consent, assignment, steps, pay and
          every change to a study. Nothing here can be edited; the check below proves it.
        </p>
      </div>
      <AuditTrail canSeal />
    </section>
  );
}
