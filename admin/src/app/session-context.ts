import { useOutletContext } from 'react-router-dom';
import type { Me } from '@/features/auth/api/get-me';

export interface StaffSession {
  me: Me;
}

/** The signed-in staff member, for routes inside the shell (the shell only renders them for staff). */
export function useStaffSession(): StaffSession {
  return useOutletContext<StaffSession>();
}
