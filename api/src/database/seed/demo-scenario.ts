import type { StaffRole } from '../../users/entities/user.entity';

/** The invented Harbor Lane Cognition Lab: demo data only, never real people. */
export const DEMO_PASSWORD = 'evenhand-demo';

export const DEMO_STAFF: Array<{ email: string; name: string; role: StaffRole }> = [
  { email: 'admin@evenhand.test', name: 'Ada Lindqvist-Oyelaran', role: 'admin' },
  { email: 'coordinator@evenhand.test', name: 'Corin Vasquez-Hale', role: 'coordinator' },
  { email: 'researcher@evenhand.test', name: 'Rhea Mbeki-Strand', role: 'researcher' },
  { email: 'auditor@evenhand.test', name: 'Aurel Quist', role: 'auditor' },
];

export const DEMO_STUDIES = [
  {
    slug: 'wayfinding-cues',
    title: 'Wayfinding cues',
    protocolNumber: 'HLCL-2026-014',
    design: 'between' as const,
    status: 'recruiting' as const,
    targetSize: 150,
    budgetMinor: 600000,
    currency: 'USD',
    blinded: true,
  },
  {
    slug: 'checkout-flows',
    title: 'Checkout flows',
    protocolNumber: 'HLCL-2026-021',
    design: 'within' as const,
    status: 'draft' as const,
    targetSize: 36,
    budgetMinor: 180000,
    currency: 'USD',
    blinded: false,
  },
];

/** Which demo staff work on which demo study. */
export const DEMO_MEMBERSHIPS: Array<{ email: string; slug: string; role: StaffRole }> = [
  { email: 'coordinator@evenhand.test', slug: 'wayfinding-cues', role: 'coordinator' },
  { email: 'researcher@evenhand.test', slug: 'wayfinding-cues', role: 'researcher' },
  { email: 'coordinator@evenhand.test', slug: 'checkout-flows', role: 'coordinator' },
  { email: 'researcher@evenhand.test', slug: 'checkout-flows', role: 'researcher' },
];
