import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';

/** What the roster page filters on; the enrollments domain validates the query before asking. */
export interface RosterFilter {
  status?: string;
  needsReconsent?: boolean;
  search?: string;
  page: number;
  pageSize: number;
}

/** One page of a study's roster: enrollment ids in display order with each participant's e-mail. */
export interface RosterRows {
  rows: Array<{ enrollmentId: string; email: string }>;
  total: number;
  countsByStatus: Record<string, number>;
}

/** Someone a roster mailing goes to: their enrollment, e-mail and the name the lab knows them by. */
export interface RosterRecipient {
  enrollmentId: string;
  email: string;
  displayName: string | null;
}

/**
 * Reads of a study's roster that need the participant's account (enrollment joined to user_account): the roster
 * page, one participant's e-mail, and the people an invitation or a re-consent request goes to.
 */
@Injectable()
export class RosterReadModel {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  async page(studyId: string, filter: RosterFilter): Promise<RosterRows> {
    const where = ['e.study_id = $1'];
    const params: unknown[] = [studyId];
    if (filter.status) where.push(`e.status = $${params.push(filter.status)}`);
    if (filter.needsReconsent) where.push('e.reconsent_requested_at IS NOT NULL');
    if (filter.search?.trim()) {
      const pattern = `%${filter.search
        .trim()
        .toLowerCase()
        .replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
      const n = params.push(pattern);
      where.push(`(lower(u.email) LIKE $${n} OR lower(e.display_name) LIKE $${n} OR lower(e.reference) LIKE $${n})`);
    }
    const from = `FROM enrollment e INNER JOIN user_account u ON u.id = e.participant_id WHERE ${where.join(' AND ')}`;
    const [{ total }] = await this.dataSource.query(`SELECT count(DISTINCT e.id) AS total ${from}`, params);
    const rows: Array<{ id: string; email: string }> = await this.dataSource.query(
      `SELECT e.id, u.email ${from} ORDER BY e.created_at DESC, e.id ASC
       LIMIT ${Number(filter.pageSize)} OFFSET ${(Number(filter.page) - 1) * Number(filter.pageSize)}`,
      params,
    );
    const counts: Array<{ status: string; n: string }> = await this.dataSource.query(
      `SELECT status, count(*) AS n FROM enrollment WHERE study_id = $1 GROUP BY status`,
      [studyId],
    );
    return {
      rows: rows.map((r) => ({ enrollmentId: r.id, email: r.email })),
      total: Number(total),
      countsByStatus: Object.fromEntries(counts.map((c) => [c.status, Number(c.n)])),
    };
  }

  async emailOfParticipant(participantId: string): Promise<string | null> {
    const rows: Array<{ email: string }> = await this.dataSource.query(`SELECT email FROM user_account WHERE id = $1`, [
      participantId,
    ]);
    return rows[0]?.email ?? null;
  }

  /**
   * Everyone still invited and (with `enrollmentIds`) among those, or else not yet sent an invitation; their
   * enrollment rows stay locked until the caller's transaction ends, so two sends cannot both invite one person.
   */
  async toInvite(
    manager: EntityManager,
    studyId: string,
    enrollmentIds: string[] | undefined,
  ): Promise<RosterRecipient[]> {
    const which = enrollmentIds ? 'e.id = ANY($2::uuid[])' : 'e.invitation_sent_at IS NULL';
    const rows: Array<{ id: string; email: string; display_name: string | null }> = await manager.query(
      `SELECT e.id, u.email, e.display_name FROM enrollment e INNER JOIN user_account u ON u.id = e.participant_id
       WHERE e.study_id = $1 AND e.status = 'invited' AND ${which} FOR UPDATE OF e`,
      enrollmentIds ? [studyId, enrollmentIds] : [studyId],
    );
    return rows.map((r) => ({ enrollmentId: r.id, email: r.email, displayName: r.display_name }));
  }

  /** Everyone taking part who has not signed the active version. */
  async toAskForReconsent(
    manager: EntityManager,
    studyId: string,
    activeVersionId: string,
  ): Promise<Array<RosterRecipient & { signedVersionId: string | null }>> {
    const rows: Array<{ id: string; email: string; display_name: string | null; signed_version_id: string | null }> =
      await manager.query(
        `SELECT e.id, u.email, e.display_name, e.signed_version_id FROM enrollment e JOIN user_account u ON u.id = e.participant_id
       WHERE e.study_id = $1 AND e.status IN ('assigned','active') AND e.signed_version_id IS DISTINCT FROM $2`,
        [studyId, activeVersionId],
      );
    return rows.map((r) => ({
      enrollmentId: r.id,
      email: r.email,
      displayName: r.display_name,
      signedVersionId: r.signed_version_id,
    }));
  }
}
