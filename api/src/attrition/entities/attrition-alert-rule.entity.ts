import {
  Column,
  CreateDateColumn,
  Entity,
  Index,
  JoinColumn,
  ManyToOne,
  PrimaryGeneratedColumn,
  UpdateDateColumn,
} from 'typeorm';
import { bigintAsNumber } from '../../database/column-transformers';
import { StudyEntity } from '../../studies';

export const ALERT_KINDS = ['differential-attrition', 'log-rank', 'pay-difference'] as const;
export type AlertKind = (typeof ALERT_KINDS)[number];
export type PayBasis = 'paid' | 'earned';

/** One threshold of a study's dropout watch; at most one rule of each kind per study. */
@Entity({ name: 'attrition_alert_rule' })
@Index('attrition_alert_rule_study_kind_key', ['studyId', 'kind'], { unique: true })
export class AttritionAlertRuleEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'study_id', type: 'uuid' })
  studyId: string;

  @ManyToOne(() => StudyEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'study_id' })
  study?: StudyEntity;

  @Column({ type: 'text' })
  kind: AlertKind;

  @Column({ type: 'boolean', default: true })
  enabled: boolean;

  /** differential-attrition: the arm the others are compared with; null for the first condition. */
  @Column({ name: 'comparison_condition_id', type: 'text', nullable: true })
  comparisonConditionId: string | null;

  /** log-rank: alert when the p-value falls below this. */
  @Column({ name: 'p_value_below', type: 'double precision', nullable: true })
  pValueBelow: number | null;

  /** pay-difference: alert when the largest difference in mean pay per randomized participant exceeds this. */
  @Column({ name: 'amount_minor', type: 'bigint', nullable: true, transformer: bigintAsNumber })
  amountMinor: number | null;

  @Column({ name: 'pay_basis', type: 'text', nullable: true })
  payBasis: PayBasis | null;

  @Column({ name: 'updated_by', type: 'uuid', nullable: true })
  updatedBy: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
