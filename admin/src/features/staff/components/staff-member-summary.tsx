import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { ModalDialog } from '@/components/ui/modal-dialog';
import { Notice } from '@/components/ui/states';
import { roleLabels } from '@/lib/role-access';
import type { StaffUser } from '../api/get-staff-users';
import { EditStaffUserForm } from './edit-staff-user-form';
import { formatMoment } from '@/lib/dates';

/** The head of one staff member's page: who they are, their role and status, and an edit button. */
export function StaffMemberSummary({ user }: { user: StaffUser }) {
  const [editing, setEditing] = useState(false);
  const [saved, setSaved] = useState(false);
  return (
    <div className="flex flex-col gap-3">
      <Link to="/staff" className="text-sm text-spruce-ink underline-offset-2 hover:underline">
        ← All staff
      </Link>
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div className="min-w-0">
          <h1 className="text-xl font-semibold break-words">{user.name || user.email}</h1>
          <p className="text-sm break-all text-ink-muted">{user.email}</p>
        </div>
        <Button onClick={() => setEditing(true)}>Edit name or role</Button>
      </div>
      <dl className="flex flex-wrap gap-x-6 gap-y-2 text-sm">
        <div className="flex items-center gap-2">
          <dt className="text-ink-muted">Role</dt>
          <dd>
            <Badge tone={user.role === 'admin' ? 'spruce' : 'neutral'}>{roleLabels[user.role]}</Badge>
          </dd>
        </div>
        <div className="flex items-center gap-2">
          <dt className="text-ink-muted">Account</dt>
          <dd>{user.active ? <Badge tone="success">Active</Badge> : <Badge tone="danger">Deactivated</Badge>}</dd>
        </div>
        <div className="flex items-center gap-2">
          <dt className="text-ink-muted">Last sign-in</dt>
          <dd className="tabular-nums">{user.lastSignInAt ? formatMoment(user.lastSignInAt) : 'Never'}</dd>
        </div>
      </dl>
      <div aria-live="polite" className="empty:hidden">
        {saved && <Notice tone="info">Changes to {user.name} were saved.</Notice>}
      </div>
      <ModalDialog open={editing} onClose={() => setEditing(false)} title={`Edit ${user.name}`}>
        {editing && (
          <EditStaffUserForm
            user={user}
            onCancel={() => setEditing(false)}
            onSaved={() => {
              setEditing(false);
              setSaved(true);
            }}
          />
        )}
      </ModalDialog>
    </div>
  );
}
