import type { EntityManager } from 'typeorm';

/**
 * Reads across enrollment, user_account, step_completion and contact that reminders and the contact log need.
 * Read-only: the owning domains keep writing their own tables.
 */
export interface ReminderCandidate {
  enrollmentId: string;
  studyId: string;
  reference: string;
  displayName: string | null;
  email: string;
  assignedAt: Date;
}

/** Everyone taking part (assigned or active) in a study that is recruiting or paused. */
export async function reminderCandidates(manager: EntityManager, studyIds?: string[]): Promise<ReminderCandidate[]> {
  const rows: Array<{
    id: string;
    study_id: string;
    reference: string;
    display_name: string | null;
    email: string;
    assigned_at: Date;
  }> = await manager.query(
    `SELECT e.id, e.study_id, e.reference, e.display_name, u.email, e.assigned_at
       FROM enrollment e
       JOIN study s ON s.id = e.study_id
       JOIN user_account u ON u.id = e.participant_id
      WHERE e.status IN ('assigned','active') AND e.assigned_at IS NOT NULL AND s.status IN ('recruiting','paused')
        AND ($1::uuid[] IS NULL OR e.study_id = ANY($1::uuid[]))
      ORDER BY e.study_id, e.assigned_at, e.id`,
    [studyIds ?? null],
  );
  return rows.map((r) => ({
    enrollmentId: r.id,
    studyId: r.study_id,
    reference: r.reference,
    displayName: r.display_name,
    email: r.email,
    assignedAt: r.assigned_at,
  }));
}

/** Reminders sent since (or at) the later of assignment and the last step done: the ones nobody answered yet. */
export async function unansweredReminders(
  manager: EntityManager,
  enrollmentIds: string[],
): Promise<Map<string, number>> {
  if (enrollmentIds.length === 0) return new Map();
  const rows: Array<{ id: string; n: number }> = await manager.query(
    `SELECT e.id,
            (SELECT count(*)::int FROM contact c
              WHERE c.enrollment_id = e.id AND c.kind = 'reminder'
                AND c.sent_at >= coalesce((SELECT max(sc.completed_at) FROM step_completion sc WHERE sc.enrollment_id = e.id AND sc.undone_at IS NULL), e.assigned_at, e.created_at)) AS n
       FROM enrollment e WHERE e.id = ANY($1::uuid[])`,
    [enrollmentIds],
  );
  return new Map(rows.map((r) => [r.id, Number(r.n)]));
}

/** Who a staff message goes to, checked against the study. */
export async function contactRecipient(
  manager: EntityManager,
  studyId: string,
  enrollmentId: string,
): Promise<{ email: string; displayName: string | null; status: string; reference: string } | null> {
  const [row] = await manager.query(
    `SELECT u.email, e.display_name, e.status, e.reference FROM enrollment e JOIN user_account u ON u.id = e.participant_id WHERE e.id = $1 AND e.study_id = $2`,
    [enrollmentId, studyId],
  );
  return row ? { email: row.email, displayName: row.display_name, status: row.status, reference: row.reference } : null;
}
