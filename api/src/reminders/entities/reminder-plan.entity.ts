import { Column, Entity, PrimaryColumn } from 'typeorm';
import type { ReminderRule } from '../reminder-planner';

/** A study's one reminder plan: the same rules for every participant, whatever their condition. */
@Entity({ name: 'reminder_plan' })
export class ReminderPlanEntity {
  @PrimaryColumn({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @Column({ type: 'jsonb' })
  rules: ReminderRule[];

  /** Unanswered reminders after which Evenhand suggests marking someone lost to follow-up. */
  @Column({ name: 'suggest_lost_after', type: 'integer', default: 3 })
  suggestLostAfter: number;

  @Column({ type: 'boolean', default: true })
  enabled: boolean;

  @Column({ name: 'updated_by', type: 'uuid', nullable: true })
  updatedBy: string | null;

  @Column({ name: 'updated_at', type: 'timestamptz', default: () => 'now()' })
  updatedAt: Date;
}
