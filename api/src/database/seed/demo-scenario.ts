import type { ReminderRule } from '../../reminders/reminder-planner';
import type { StepOpensFrom, StepVerification } from '../../steps/step-window';
import type { StaffRole } from '../../users/entities/user.entity';

/** The invented Harbor Lane Cognition Lab: demo data only, never real people. */
export const DEMO_PASSWORD = 'evenhand-demo';

export const DEMO_STAFF: Array<{ email: string; name: string; role: StaffRole }> = [
  { email: 'admin@evenhand.test', name: 'Ada Lindqvist-Oyelaran', role: 'admin' },
  { email: 'coordinator@evenhand.test', name: 'Corin Vasquez-Hale', role: 'coordinator' },
  { email: 'researcher@evenhand.test', name: 'Rhea Mbeki-Strand', role: 'researcher' },
  { email: 'auditor@evenhand.test', name: 'Aurel Quist', role: 'auditor' },
];

export const DEMO_LAB = {
  labName: 'Harbor Lane Cognition Lab',
  consentValues: {
    institutionName: 'Harbor Lane Institute',
    investigatorName: 'Dr. Imre Valcourt',
    contactPhone: '+1 555 0100',
    ethicsBoardName: 'Harbor Lane Research Ethics Board',
    ethicsBoardContact: 'ethics@harborlane.test, +1 555 0199',
    paymentMethod: 'a transfer to the payout account you set up in the study portal',
    paymentDays: 14,
    dataRetentionYears: 5,
    futureUseDeidentified: false,
  },
};

export interface DemoStudy {
  slug: string;
  title: string;
  protocolNumber: string;
  design: 'between' | 'within';
  summary: string;
  estimatedMinutes: number;
  targetSize: number;
  budgetMinor: number;
  contactEmail: string;
  blinded: boolean;
  purpose: string;
  conditions: Array<{ internalName: string; participantLabel: string; participantInstructions: string }>;
  factors: Array<{ key: string; label: string; kind: 'numeric'; cutPoints: number[] }>;
  screening: Array<{ key: string; label: string; kind: 'yes-no'; eligibleValues: [boolean]; criterion: string }>;
  /**
   * `task` names a page of the demo task stand-in (demo-task-server.ts); the step's task address is that page under
   * DEMO_TASK_URL. Windows count days from assignment or from the previous step being done.
   */
  steps: Array<{
    title: string;
    description: string;
    payMinor: number;
    verification: StepVerification;
    task?: string;
    opensAfterDays: number;
    opensFrom: StepOpensFrom;
    dueWithinDays: number | null;
  }>;
  /** The study's one reminder plan, the same for every condition. */
  reminders: { rules: ReminderRule[]; suggestLostAfter: number };
  scheme: Record<string, unknown>;
  approvalReference: string;
  /** How many demo participants sign up, and how many of them fail screening. */
  participants: { prefix: string; first: number; count: number; excluded: number };
  /** An amendment activated after everyone signed; this many sign it again. */
  amendment?: { approvalReference: string; note: string; resign: number };
  /**
   * Invented history for the dropout watch: assignments spread over `days`, each step done within its window, and
   * the probability of stopping by condition (internal name).
   */
  history?: { days: number; dropoutByCondition: Record<string, number>; withdrawalReasons: string[] };
  /**
   * Money so far: card fundings (days ago), payouts approved and paid when they were older than `paidAfterDays`,
   * the last `notSetUp` payees never set up getting paid, and one payout that failed because its payee had not
   * finished setting up yet (they have since, so a retry goes through).
   */
  pay?: {
    fundings: Array<{ amountMinor: number; daysAgo: number }>;
    paidAfterDays?: number;
    notSetUp?: number;
    failedOnce?: boolean;
  };
  /** A finished pilot: closed once its people signed, then archived (it shows under Studies › Archive). */
  closedAndArchived?: boolean;
}

export const DEMO_STUDIES: DemoStudy[] = [
  {
    slug: 'wayfinding-cues',
    title: 'Wayfinding cues',
    protocolNumber: 'HLCL-2026-014',
    design: 'between',
    summary:
      'Three short online sessions in which you find your way through a virtual building, then a short call with the team. We compare different kinds of route help.',
    estimatedMinutes: 85,
    targetSize: 150,
    budgetMinor: 600000,
    contactEmail: 'wayfinding@harborlane.test',
    blinded: true,
    purpose:
      'We want to learn which kind of route help lets people find their way best in a building they have never seen.',
    conditions: [
      {
        internalName: 'audio cues',
        participantLabel: 'Route guide, version 1',
        participantInstructions:
          'Turn your sound on. At each junction you will hear a short spoken hint about where to go next.',
      },
      {
        internalName: 'map cues',
        participantLabel: 'Route guide, version 2',
        participantInstructions:
          'A small floor plan stays in the corner of the screen. Your position is shown on it as you walk.',
      },
      {
        internalName: 'no cues',
        participantLabel: 'Route guide, version 3',
        participantInstructions: 'Find your way using what you see in the building: signs, doors and landmarks.',
      },
    ],
    factors: [
      {
        key: 'sense_of_direction',
        label: 'On a scale from 0 to 100, how good is your sense of direction?',
        kind: 'numeric',
        cutPoints: [50],
      },
    ],
    screening: [
      { key: 'adult', label: 'Are you 18 or older?', kind: 'yes-no', eligibleValues: [true], criterion: '18 or older' },
      {
        key: 'vision',
        label: 'Can you see a computer screen clearly (with glasses or lenses if you use them)?',
        kind: 'yes-no',
        eligibleValues: [true],
        criterion: 'Able to see a screen clearly',
      },
    ],
    // The sessions run in the lab's own task tool and bring people back by return link; the call is checked off by staff.
    steps: [
      {
        title: 'Session 1: learning the building',
        description: 'About 20 minutes, online. You can start as soon as you have signed.',
        payMinor: 1000,
        verification: 'return-link',
        task: 'wayfinding-session-1',
        opensAfterDays: 0,
        opensFrom: 'assignment',
        dueWithinDays: 3,
      },
      {
        title: 'Session 2: finding rooms',
        description: 'About 25 minutes, online, at least a day after session 1.',
        payMinor: 1200,
        verification: 'return-link',
        task: 'wayfinding-session-2',
        opensAfterDays: 1,
        opensFrom: 'previous-step',
        dueWithinDays: 4,
      },
      {
        title: 'Session 3: finding rooms again',
        description: 'About 30 minutes, online, a week after session 2.',
        payMinor: 1500,
        verification: 'return-link',
        task: 'wayfinding-session-3',
        opensAfterDays: 7,
        opensFrom: 'previous-step',
        dueWithinDays: 5,
      },
      {
        title: 'Debrief call',
        description: 'Ten minutes by phone or video with the research team, who mark it done.',
        payMinor: 500,
        verification: 'staff',
        opensAfterDays: 0,
        opensFrom: 'previous-step',
        dueWithinDays: 7,
      },
    ],
    reminders: {
      rules: [
        { anchor: 'opens', days: 0 },
        { anchor: 'due', days: 1 },
        { anchor: 'due', days: 0 },
      ],
      suggestLostAfter: 3,
    },
    scheme: { method: 'stratified-blocks', blockSizes: [3, 6] },
    approvalReference: 'HLREB-2026-031',
    participants: { prefix: 'p', first: 1, count: 48, excluded: 3 },
    amendment: { approvalReference: 'HLREB-2026-031-A1', note: 'Session 3 may also be done on a tablet.', resign: 38 },
    // People without any route help get lost in the building and give up more often: the watch should light up.
    history: {
      days: 42,
      dropoutByCondition: { 'audio cues': 0.12, 'map cues': 0.15, 'no cues': 0.55 },
      withdrawalReasons: ['The tasks took longer than I expected', 'Too frustrating to find the rooms', 'Moved house'],
    },
    pay: {
      fundings: [
        { amountMinor: 80000, daysAgo: 38 },
        { amountMinor: 60000, daysAgo: 12 },
      ],
      paidAfterDays: 6,
      notSetUp: 3,
      failedOnce: true,
    },
  },
  {
    slug: 'checkout-flows',
    title: 'Checkout flows',
    protocolNumber: 'HLCL-2026-021',
    design: 'within',
    summary:
      'One online session in which you buy a few things in three versions of a pretend shop and tell us how it went.',
    estimatedMinutes: 40,
    targetSize: 36,
    budgetMinor: 180000,
    contactEmail: 'checkout@harborlane.test',
    blinded: false,
    purpose:
      'We want to learn how the design of an online checkout changes how quickly and comfortably people finish a purchase.',
    conditions: [
      {
        internalName: 'one-page checkout',
        participantLabel: 'Shop A',
        participantInstructions: 'Buy the three items on your list in Shop A.',
      },
      {
        internalName: 'step-by-step checkout',
        participantLabel: 'Shop B',
        participantInstructions: 'Buy the three items on your list in Shop B.',
      },
      {
        internalName: 'express checkout',
        participantLabel: 'Shop C',
        participantInstructions: 'Buy the three items on your list in Shop C.',
      },
    ],
    factors: [],
    screening: [
      { key: 'adult', label: 'Are you 18 or older?', kind: 'yes-no', eligibleValues: [true], criterion: '18 or older' },
    ],
    // The shop shows each participant their own code at the end; they type it on the study page.
    steps: [
      {
        title: 'The shopping session',
        description: 'About 40 minutes in one sitting. At the end the pretend shop shows your own completion code.',
        payMinor: 2500,
        verification: 'participant-code',
        task: 'checkout-shopping',
        opensAfterDays: 0,
        opensFrom: 'assignment',
        dueWithinDays: 7,
      },
    ],
    reminders: {
      rules: [
        { anchor: 'opens', days: 0 },
        { anchor: 'due', days: 2 },
      ],
      suggestLostAfter: 2,
    },
    scheme: { method: 'williams', squaresPerBlock: [1] },
    approvalReference: 'HLREB-2026-044',
    participants: { prefix: 'p', first: 101, count: 12, excluded: 0 },
    pay: { fundings: [{ amountMinor: 30000, daysAgo: 3 }] },
  },
  {
    slug: 'signage-pilot',
    title: 'Signage pilot',
    protocolNumber: 'HLCL-2025-088',
    design: 'between',
    summary: 'A finished pilot: one short online session looking at two styles of building signs.',
    estimatedMinutes: 15,
    targetSize: 6,
    budgetMinor: 6000,
    contactEmail: 'signage@harborlane.test',
    blinded: false,
    purpose: 'We wanted to try out, on a few people, how two styles of building signs are read before a larger study.',
    conditions: [
      {
        internalName: 'pictogram signs',
        participantLabel: 'Sign set 1',
        participantInstructions: 'Look at each sign in set 1 and say where it points.',
      },
      {
        internalName: 'text signs',
        participantLabel: 'Sign set 2',
        participantInstructions: 'Look at each sign in set 2 and say where it points.',
      },
    ],
    factors: [],
    screening: [
      { key: 'adult', label: 'Are you 18 or older?', kind: 'yes-no', eligibleValues: [true], criterion: '18 or older' },
    ],
    steps: [
      {
        title: 'The sign session',
        description: 'About 15 minutes with a member of the lab.',
        payMinor: 1000,
        verification: 'staff',
        opensAfterDays: 0,
        opensFrom: 'assignment',
        dueWithinDays: null,
      },
    ],
    reminders: { rules: [{ anchor: 'opens', days: 0 }], suggestLostAfter: 2 },
    scheme: { method: 'simple' },
    approvalReference: 'HLREB-2025-102',
    participants: { prefix: 's', first: 201, count: 4, excluded: 0 },
    closedAndArchived: true,
  },
];

/** Which demo staff work on which demo study (the coordinator creates them and is a member already). */
export const DEMO_MEMBERSHIPS: Array<{ email: string; slug: string; role: 'coordinator' | 'researcher' | 'auditor' }> =
  [
    { email: 'researcher@evenhand.test', slug: 'wayfinding-cues', role: 'researcher' },
    { email: 'researcher@evenhand.test', slug: 'checkout-flows', role: 'researcher' },
  ];

/** Where the demo task stand-in answers: DEMO_TASK_URL, set by `npm start` and `npm test` to the port they run it on. */
export function demoTaskAddress(task: string, base = process.env.DEMO_TASK_URL || 'http://127.0.0.1:3300'): string {
  return new URL(`/task/${task}`, base).toString();
}

export function demoParticipantEmail(prefix: string, n: number): string {
  return `${prefix}${String(n).padStart(3, '0')}@evenhand.test`;
}
