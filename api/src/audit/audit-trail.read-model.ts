import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { AuditException } from './audit.exception';
import {
  ACTION_FAMILIES,
  actionsInFamilies,
  ActionFamily,
  describeEvent,
  knownActionCodes,
  personPhrase,
  SentenceContext,
} from './audit-sentences';
import { AuditSelection, selectionBounds } from './audit-trail-selection';

/** One stored event with everything its sentence needs: the trail as people read it. */
export interface TrailEvent {
  id: string;
  chain: string;
  sequence: number;
  at: Date;
  actorId: string | null;
  actorEmail: string | null;
  action: string;
  subjectType: string | null;
  subjectId: string | null;
  data: Record<string, unknown>;
  previousHash: string;
  hash: string;
  keyId: string | null;
  family: ActionFamily;
  name: string;
  sentence: string;
  actorPhrase: string;
  participantReference: string | null;
  studyTitle: string | null;
  studySlug: string | null;
  amount: { minor: number; currency: string } | null;
}

interface EnrichedRow {
  id: string;
  chain: string;
  sequence: number;
  at: Date;
  actor_id: string | null;
  actor_email: string | null;
  action: string;
  subject_type: string | null;
  subject_id: string | null;
  data: Record<string, unknown>;
  previous_hash: string;
  hash: string;
  key_id: string | null;
  actor_name: string | null;
  actor_account_email: string | null;
  actor_role: string | null;
  study_title: string | null;
  study_slug: string | null;
  study_currency: string | null;
  subject_reference: string | null;
  payout_reference: string | null;
  actor_reference: string | null;
  payout_amount_minor: string | null;
  payout_currency: string | null;
  step_title: string | null;
  subject_name: string | null;
  subject_email: string | null;
  subject_role: string | null;
}

const UUID_TEXT = `'^[0-9a-fA-F]{8}-[0-9a-fA-F]{4}-[0-9a-fA-F]{4}-[0-9a-fA-F]{4}-[0-9a-fA-F]{12}$'`;

/** Most rows one export may hold; a larger selection is refused with a request to narrow it. */
export const EXPORT_ROW_LIMIT = 100_000;

/**
 * The audit trail's read model: the stored events joined to the accounts, studies, enrollments, payouts and steps
 * they name, filtered the way an auditor asks (participant, staff member, dates, families). Read-only; the chain
 * itself is written only by AuditService.
 */
@Injectable()
export class AuditTrailReadModel {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  async page(
    selection: AuditSelection,
    page: number,
    pageSize: number,
  ): Promise<{ items: TrailEvent[]; total: number }> {
    const where = await this.whereOf(selection);
    const [{ total }] = await this.dataSource.query(
      `SELECT count(*)::int AS total FROM audit_event ev WHERE ${where.sql}`,
      where.params,
    );
    const ids: Array<{ id: string }> = await this.dataSource.query(
      `SELECT ev.id FROM audit_event ev WHERE ${where.sql} ORDER BY ev.at DESC, ev.chain, ev.sequence DESC LIMIT $${where.params.length + 1} OFFSET $${where.params.length + 2}`,
      [...where.params, pageSize, (page - 1) * pageSize],
    );
    return { items: await this.enrich(ids.map((row) => row.id)), total };
  }

  /** The whole selection, newest first, a page at a time (for the export). */
  async *all(selection: AuditSelection): AsyncGenerator<TrailEvent[]> {
    const where = await this.whereOf(selection);
    const [{ total }] = await this.dataSource.query(
      `SELECT count(*)::int AS total FROM audit_event ev WHERE ${where.sql}`,
      where.params,
    );
    if (total > EXPORT_ROW_LIMIT) {
      throw new AuditException(
        'VALIDATION_FAILED',
        `This selection holds ${total} events; an export holds at most ${EXPORT_ROW_LIMIT}. Narrow the dates or families.`,
        [{ field: 'from', message: `narrow the selection to at most ${EXPORT_ROW_LIMIT} events` }],
      );
    }
    const pageSize = 2000;
    for (let offset = 0; offset < total; offset += pageSize) {
      const ids: Array<{ id: string }> = await this.dataSource.query(
        `SELECT ev.id FROM audit_event ev WHERE ${where.sql} ORDER BY ev.at DESC, ev.chain, ev.sequence DESC LIMIT $${where.params.length + 1} OFFSET $${where.params.length + 2}`,
        [...where.params, pageSize, offset],
      );
      if (ids.length === 0) return;
      yield await this.enrich(ids.map((row) => row.id));
    }
  }

  /** Counts per family and per chain over the selection, for the export's summary. */
  async counts(
    selection: AuditSelection,
  ): Promise<{ total: number; byAction: Map<string, number>; byChain: Map<string, number> }> {
    const where = await this.whereOf(selection);
    const rows: Array<{ chain: string; action: string; n: number }> = await this.dataSource.query(
      `SELECT ev.chain, ev.action, count(*)::int AS n FROM audit_event ev WHERE ${where.sql} GROUP BY ev.chain, ev.action`,
      where.params,
    );
    const byAction = new Map<string, number>();
    const byChain = new Map<string, number>();
    let total = 0;
    for (const row of rows) {
      byAction.set(row.action, (byAction.get(row.action) ?? 0) + row.n);
      byChain.set(row.chain, (byChain.get(row.chain) ?? 0) + row.n);
      total += row.n;
    }
    return { total, byAction, byChain };
  }

  /** The event at one place in one chain, in words (to name the first failing event of a check). */
  async eventAt(chain: string, sequence: number): Promise<TrailEvent | null> {
    const [row] = await this.dataSource.query(`SELECT id FROM audit_event WHERE chain = $1 AND sequence = $2`, [
      chain,
      sequence,
    ]);
    return row ? ((await this.enrich([row.id]))[0] ?? null) : null;
  }

  async studyTitles(chains: string[]): Promise<Map<string, { title: string; slug: string }>> {
    const ids = chains.filter((chain) => new RegExp(UUID_TEXT.slice(1, -1)).test(chain));
    if (ids.length === 0) return new Map();
    const rows: Array<{ id: string; title: string; slug: string }> = await this.dataSource.query(
      `SELECT id, title, slug FROM study WHERE id = ANY($1::uuid[])`,
      [ids],
    );
    return new Map(rows.map((row) => [row.id, { title: row.title, slug: row.slug }]));
  }

  /** What the filters can be set to: the families, every staff account, every study. */
  async filterOptions() {
    const staff: Array<{ id: string; name: string; email: string; role: string }> = await this.dataSource.query(
      `SELECT id, name, email, role FROM user_account WHERE role <> 'participant' ORDER BY name, email`,
    );
    const studies: Array<{ id: string; title: string; slug: string }> = await this.dataSource.query(
      `SELECT id, title, slug FROM study ORDER BY title`,
    );
    return {
      families: ACTION_FAMILIES.map((family) => ({
        key: family.key,
        label: family.label,
        description: family.description,
      })),
      staff: staff.map((person) => ({ ...person, phrase: personPhrase(person) })),
      studies,
    };
  }

  private async whereOf(selection: AuditSelection): Promise<{ sql: string; params: unknown[] }> {
    const params: unknown[] = [];
    const clauses: string[] = ['TRUE'];
    const param = (value: unknown) => {
      params.push(value);
      return `$${params.length}`;
    };
    const { from, before } = selectionBounds(selection);
    if (selection.chain) clauses.push(`ev.chain = ${param(selection.chain)}`);
    if (selection.action) clauses.push(`ev.action = ${param(selection.action)}`);
    if (selection.staff) clauses.push(`ev.actor_id = ${param(selection.staff)}::uuid`);
    if (from) clauses.push(`ev.at >= ${param(from)}`);
    if (before) clauses.push(`ev.at < ${param(before)}`);
    if (selection.family?.length) {
      const families = new Set(selection.family);
      const named = actionsInFamilies([...families]);
      const parts = [`ev.action = ANY(${param(named)}::text[])`];
      if (families.has('other')) parts.push(`NOT (ev.action = ANY(${param(knownActionCodes())}::text[]))`);
      clauses.push(`(${parts.join(' OR ')})`);
    }
    if (selection.participant) {
      const targets: Array<{ id: string; study_id: string; participant_id: string }> = await this.dataSource.query(
        `SELECT id, study_id, participant_id FROM enrollment WHERE upper(reference) = $1${selection.chain && selection.chain !== 'lab' ? ' AND study_id::text = $2' : ''}`,
        selection.chain && selection.chain !== 'lab'
          ? [selection.participant, selection.chain]
          : [selection.participant],
      );
      if (targets.length === 0) {
        clauses.push('FALSE');
      } else {
        const enrollments = param(targets.map((t) => t.id));
        const studies = param(targets.map((t) => t.study_id));
        const people = param(targets.map((t) => t.participant_id));
        const reference = param(selection.participant);
        clauses.push(`(
          (ev.subject_type = 'enrollment' AND ev.subject_id = ANY(${enrollments}::text[]))
          OR (ev.subject_type = 'payout' AND ev.subject_id IN (SELECT p.id::text FROM payout p WHERE p.enrollment_id = ANY(${enrollments}::uuid[])))
          OR (ev.action = 'payout.approved' AND jsonb_exists_any(ev.data->'payoutIds', ARRAY(SELECT p.id::text FROM payout p WHERE p.enrollment_id = ANY(${enrollments}::uuid[]))))
          OR (ev.chain = ANY(${studies}::text[]) AND upper(ev.data->>'reference') = ${reference})
          OR (ev.actor_id = ANY(${people}::uuid[]) AND (ev.chain = ANY(${studies}::text[]) OR ev.chain = 'lab'))
          OR (ev.chain = 'lab' AND ev.subject_type = 'user' AND ev.subject_id = ANY(${people}::text[]))
        )`);
      }
    }
    return { sql: clauses.join(' AND '), params };
  }

  /** The events with these ids, joined to what their sentences need, newest first. */
  private async enrich(ids: string[]): Promise<TrailEvent[]> {
    if (ids.length === 0) return [];
    const rows: EnrichedRow[] = await this.dataSource.query(
      `SELECT ev.id, ev.chain, ev.sequence, ev.at, ev.actor_id, ev.actor_email, ev.action, ev.subject_type, ev.subject_id, ev.data,
              ev.previous_hash, ev.hash, ev.key_id,
              actor.name AS actor_name, actor.email AS actor_account_email, actor.role AS actor_role,
              s.title AS study_title, s.slug AS study_slug, s.currency AS study_currency,
              subject_enrollment.reference AS subject_reference,
              payout_enrollment.reference AS payout_reference,
              actor_enrollment.reference AS actor_reference,
              po.amount_minor AS payout_amount_minor, po.currency AS payout_currency,
              st.title AS step_title,
              subject_user.name AS subject_name, subject_user.email AS subject_email, subject_user.role AS subject_role
         FROM audit_event ev
         LEFT JOIN user_account actor ON actor.id = ev.actor_id
         LEFT JOIN study s ON ev.chain ~ ${UUID_TEXT} AND s.id = (CASE WHEN ev.chain ~ ${UUID_TEXT} THEN ev.chain END)::uuid
         LEFT JOIN enrollment subject_enrollment
                ON ev.subject_type = 'enrollment' AND subject_enrollment.id = (CASE WHEN ev.subject_id ~ ${UUID_TEXT} THEN ev.subject_id END)::uuid
         LEFT JOIN payout po ON ev.subject_type = 'payout' AND po.id = (CASE WHEN ev.subject_id ~ ${UUID_TEXT} THEN ev.subject_id END)::uuid
         LEFT JOIN enrollment payout_enrollment ON payout_enrollment.id = po.enrollment_id
         LEFT JOIN enrollment actor_enrollment ON actor_enrollment.participant_id = ev.actor_id AND actor_enrollment.study_id = s.id
         LEFT JOIN step st ON st.id = (CASE
                WHEN ev.data->>'stepId' ~ ${UUID_TEXT} THEN ev.data->>'stepId'
                WHEN ev.subject_type = 'step' AND ev.subject_id ~ ${UUID_TEXT} THEN ev.subject_id END)::uuid
         LEFT JOIN user_account subject_user ON ev.subject_type = 'user' AND subject_user.id = (CASE WHEN ev.subject_id ~ ${UUID_TEXT} THEN ev.subject_id END)::uuid
        WHERE ev.id = ANY($1::uuid[])
        ORDER BY ev.at DESC, ev.chain, ev.sequence DESC`,
      [ids],
    );
    return rows.map((row) => toTrailEvent(row));
  }
}

function toTrailEvent(row: EnrichedRow): TrailEvent {
  const actor =
    row.actor_id && row.actor_role
      ? { name: row.actor_name ?? '', email: row.actor_account_email ?? '', role: row.actor_role }
      : null;
  const actorIsParticipant = actor?.role === 'participant';
  const participantReference =
    row.subject_reference ??
    row.payout_reference ??
    (actorIsParticipant ? row.actor_reference : null) ??
    (typeof row.data?.reference === 'string' && row.chain !== 'lab' ? row.data.reference : null);
  const context: SentenceContext = {
    actor,
    participantReference,
    actorIsParticipant,
    subjectPerson: row.subject_role
      ? { name: row.subject_name ?? '', email: row.subject_email ?? '', role: row.subject_role }
      : null,
    stepTitle: row.step_title,
    currency: (row.payout_currency ?? row.study_currency)?.trim() ?? null,
    payoutAmountMinor: row.payout_amount_minor === null ? null : Number(row.payout_amount_minor),
  };
  const words = describeEvent(
    { action: row.action, actorEmail: row.actor_email, subjectId: row.subject_id, data: row.data ?? {} },
    context,
  );
  return {
    id: row.id,
    chain: row.chain,
    sequence: Number(row.sequence),
    at: new Date(row.at),
    actorId: row.actor_id,
    actorEmail: row.actor_email,
    action: row.action,
    subjectType: row.subject_type,
    subjectId: row.subject_id,
    data: row.data ?? {},
    previousHash: row.previous_hash,
    hash: row.hash,
    keyId: row.key_id,
    ...words,
    actorPhrase: actorPhraseOf(row, context),
    participantReference,
    studyTitle: row.study_title,
    studySlug: row.study_slug,
  };
}

function actorPhraseOf(row: EnrichedRow, context: SentenceContext): string {
  if (context.actorIsParticipant)
    return context.participantReference ? `Participant ${context.participantReference}` : 'A participant';
  if (context.actor) return personPhrase(context.actor);
  return row.actor_email ?? 'Evenhand';
}
