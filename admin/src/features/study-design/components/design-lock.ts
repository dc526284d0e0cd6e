/** Why part of the set-up cannot change now; null when it can. */
export type DesignLock = 'assigned' | 'closed' | 'role' | null;

export interface SetupPermissions {
  /** Conditions (adding, weights), stratification factors and the scheme: fixed after the first assignment. */
  design: DesignLock;
  /** Wording participants read, steps and pay, screening: correctable until the study closes. */
  content: DesignLock;
  /** Paying one condition differently is a researcher’s (or admin’s) decision. */
  payOverrides: DesignLock;
  /** The study is open but nobody is assigned yet: design changes seal a fresh sequence. */
  resealsOnChange: boolean;
}

export const lockExplanations: Record<Exclude<DesignLock, null>, string> = {
  assigned:
    'Fixed: someone has already been assigned. Changing conditions, weights, strata or the scheme now would break the sealed sequence that later verification replays, so Evenhand keeps them as they were.',
  closed: 'The study is closed and sealed; nothing in its set-up can change.',
  role: 'Your role can see this but not change it.',
};
