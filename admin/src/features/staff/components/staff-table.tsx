import { Link } from 'react-router-dom';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { tableRecipe } from '@/components/ui/recipes';
import { roleLabels } from '@/lib/role-access';
import type { StaffUser } from '../api/get-staff-users';
import { formatMoment } from '@/lib/dates';

export interface StaffTableProps {
  users: readonly StaffUser[];
  /** The signed-in admin, who may not deactivate themself. */
  currentUserId: string;
  onEdit: (user: StaffUser) => void;
  onToggleActive: (user: StaffUser) => void;
  busy?: boolean;
}

export function StaffTable({ users, currentUserId, onEdit, onToggleActive, busy = false }: StaffTableProps) {
  return (
    <div className={tableRecipe.frame}>
      <table className={tableRecipe.table} aria-busy={busy}>
        <caption className="sr-only">Staff accounts</caption>
        <thead>
          <tr>
            <th scope="col" className={tableRecipe.headCell}>
              Name
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              E-mail
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Role
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Status
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              Last sign-in
            </th>
            <th scope="col" className={tableRecipe.headCell}>
              <span className="sr-only">Actions</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {users.map((user) => {
            const isSelf = user.id === currentUserId;
            return (
              <tr key={user.id} className={tableRecipe.row}>
                <td className={`${tableRecipe.cell} font-medium`}>
                  <Link to={`/staff/${user.id}`} className="text-spruce-ink underline-offset-2 hover:underline">
                    {user.name}
                  </Link>
                  {isSelf && <span className="ml-1.5 text-xs font-normal text-ink-faint">(you)</span>}
                </td>
                <td className={`${tableRecipe.cell} whitespace-nowrap text-ink-muted`}>{user.email}</td>
                <td className={tableRecipe.cell}>
                  <Badge tone={user.role === 'admin' ? 'spruce' : 'neutral'}>{roleLabels[user.role]}</Badge>
                </td>
                <td className={tableRecipe.cell}>
                  {user.active ? <Badge tone="success">Active</Badge> : <Badge tone="danger">Deactivated</Badge>}
                </td>
                <td className={`${tableRecipe.cell} whitespace-nowrap text-ink-muted tabular-nums`}>
                  {user.lastSignInAt ? formatMoment(user.lastSignInAt) : 'Never'}
                </td>
                <td className={`${tableRecipe.cell} text-right whitespace-nowrap`}>
                  <Button variant="quiet" size="compact" onClick={() => onEdit(user)} aria-label={`Edit ${user.name}`}>
                    Edit
                  </Button>
                  <Button
                    variant="quiet"
                    size="compact"
                    onClick={() => onToggleActive(user)}
                    disabled={isSelf && user.active}
                    title={isSelf && user.active ? 'You cannot deactivate your own account.' : undefined}
                    aria-label={`${user.active ? 'Deactivate' : 'Reactivate'} ${user.name}`}
                  >
                    {user.active ? 'Deactivate' : 'Reactivate'}
                  </Button>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
