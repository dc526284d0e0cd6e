import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';

/** One of a participant's payouts across studies, with the study's and the step's titles. */
export interface ParticipantPayoutRow {
  id: string;
  kind: 'step' | 'bonus';
  amount_minor: string | number;
  currency: string;
  status: string;
  created_at: Date;
  paid_at: Date | null;
  receipt_number: string | null;
  study_title: string;
  step_title: string | null;
}

/** A participant's own payouts in every study, newest first (payout joined to study, step completion and step). */
@Injectable()
export class ParticipantPayoutsReadModel {
  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  async of(participantId: string): Promise<ParticipantPayoutRow[]> {
    return this.dataSource.query(
      `SELECT p.id, p.kind, p.amount_minor, p.currency, p.status, p.created_at, p.paid_at, p.receipt_number, st.title AS study_title, s.title AS step_title
       FROM payout p JOIN study st ON st.id = p.study_id
       LEFT JOIN step_completion c ON c.id = p.step_completion_id LEFT JOIN step s ON s.id = c.step_id
       WHERE p.participant_id = $1 ORDER BY p.created_at DESC`,
      [participantId],
    );
  }
}
