import { Column, Entity, JoinColumn, OneToOne, PrimaryColumn } from 'typeorm';
import { AttritionAlertRuleEntity } from './attrition-alert-rule.entity';

/** Where a rule stood at its last evaluation: crossed rules stay quiet until they go back below and cross again. */
@Entity({ name: 'attrition_alert_state' })
export class AttritionAlertStateEntity {
  @PrimaryColumn({ name: 'rule_id', type: 'uuid' })
  ruleId: string;

  @OneToOne(() => AttritionAlertRuleEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'rule_id' })
  rule?: AttritionAlertRuleEntity;

  @Column({ type: 'boolean', default: false })
  crossed: boolean;

  @Column({ name: 'last_value', type: 'double precision', nullable: true })
  lastValue: number | null;

  @Column({ name: 'last_threshold', type: 'double precision', nullable: true })
  lastThreshold: number | null;

  @Column({ name: 'evaluated_at', type: 'timestamptz', nullable: true })
  evaluatedAt: Date | null;

  @Column({ name: 'crossed_at', type: 'timestamptz', nullable: true })
  crossedAt: Date | null;

  @Column({ name: 'notified_at', type: 'timestamptz', nullable: true })
  notifiedAt: Date | null;

  @Column({ type: 'integer', default: 0 })
  crossings: number;
}
