import { Navigate } from 'react-router-dom';
import { homePathFor } from '@/lib/role-access';
import { useStaffSession } from '../../session-context';

export function Component() {
  const { me } = useStaffSession();
  const home = homePathFor(me.role);
  return home ? <Navigate to={home} replace /> : null;
}
