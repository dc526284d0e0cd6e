import { Injectable, Logger, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager, In } from 'typeorm';
import { AuditService } from '../../audit';
import type { SessionUser } from '../../common/auth/session-user';
import { DomainException, ValidationException } from '../../common/errors/domain.exception';
import { AppConfig } from '../../config/app-config';
import { JOB_NAMES, JobQueueService } from '../../jobs/job-queue.service';
import { MailService } from '../../mail/mail.service';
import { StudiesService } from '../../studies';
import { type AttritionFigures, AttritionService } from '../attrition.service';
import { AttritionAlertsDto, AlertStateDto, PutAttritionAlertsDto } from '../dto/attrition-alerts.dto';
import { AttritionAlertRuleEntity, type AlertKind } from '../entities/attrition-alert-rule.entity';
import { AttritionAlertStateEntity } from '../entities/attrition-alert-state.entity';
import { type AlertReading, type AlertRule, alertTransition, readAlert } from './alert-rules';

export const ALERTS_EVERY_MINUTES = 5;
const DEFAULT_P_VALUE_BELOW = 0.05;
const DEFAULT_AMOUNT_MINOR = 500;
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export interface AlertEvaluation {
  studyId: string;
  /** Kinds that crossed in this evaluation (and were e-mailed, when the study has researchers). */
  newlyCrossed: AlertKind[];
  /** Kinds that went back below, so they alert again on the next crossing. */
  backBelow: AlertKind[];
  recipients: string[];
  readings: AlertReading[];
}

interface RuleWithState {
  rule: AttritionAlertRuleEntity;
  state: AttritionAlertStateEntity;
}

function toRule(rule: AttritionAlertRuleEntity): AlertRule {
  if (rule.kind === 'log-rank') return { kind: 'log-rank', pValueBelow: rule.pValueBelow as number };
  if (rule.kind === 'pay-difference')
    return { kind: 'pay-difference', amountMinor: rule.amountMinor as number, basis: rule.payBasis ?? 'earned' };
  return { kind: 'differential-attrition' };
}

function stateDto(state: AttritionAlertStateEntity | undefined): AlertStateDto {
  return {
    crossed: state?.crossed ?? false,
    lastValue: state?.lastValue ?? null,
    lastThreshold: state?.lastThreshold ?? null,
    evaluatedAt: state?.evaluatedAt?.toISOString() ?? null,
    crossedAt: state?.crossedAt?.toISOString() ?? null,
    notifiedAt: state?.notifiedAt?.toISOString() ?? null,
    crossings: state?.crossings ?? 0,
  };
}

/**
 * Per-study thresholds on the dropout watch. A scheduled job evaluates every study with enabled rules and e-mails
 * the study's researchers once per crossing: a rule that stays above its threshold stays quiet, and one that goes
 * back below is re-armed.
 */
@Injectable()
export class AttritionAlertsService implements OnModuleInit {
  private readonly logger = new Logger('AttritionAlerts');

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly attrition: AttritionService,
    private readonly studies: StudiesService,
    private readonly audit: AuditService,
    private readonly mail: MailService,
    private readonly jobs: JobQueueService,
    private readonly config: AppConfig,
  ) {}

  async onModuleInit(): Promise<void> {
    await this.jobs.handle(JOB_NAMES.evaluateAttritionAlerts, async () => {
      await this.evaluateAll();
    });
    await this.jobs.schedule(JOB_NAMES.evaluateAttritionAlerts, `*/${ALERTS_EVERY_MINUTES} * * * *`);
  }

  watchUrl(studyId: string): string {
    return `${this.config.adminUrl.replace(/\/+$/, '')}/studies/${studyId}/watch`;
  }

  private async rulesOf(studyId: string, manager: EntityManager = this.dataSource.manager): Promise<RuleWithState[]> {
    const rules = await manager.find(AttritionAlertRuleEntity, { where: { studyId } });
    const states =
      rules.length === 0
        ? []
        : await manager.find(AttritionAlertStateEntity, { where: { ruleId: In(rules.map((rule) => rule.id)) } });
    return rules.map((rule) => ({
      rule,
      state:
        states.find((state) => state.ruleId === rule.id) ??
        manager.create(AttritionAlertStateEntity, { ruleId: rule.id }),
    }));
  }

  async get(studyId: string): Promise<AttritionAlertsDto> {
    const study = await this.studies.require(studyId);
    const rules = await this.rulesOf(studyId);
    const find = (kind: AlertKind) => rules.find((entry) => entry.rule.kind === kind);
    const differential = find('differential-attrition');
    const logRank = find('log-rank');
    const pay = find('pay-difference');
    return {
      studyId,
      evaluatedEveryMinutes: ALERTS_EVERY_MINUTES,
      watchUrl: this.watchUrl(studyId),
      differentialAttrition: {
        enabled: differential?.rule.enabled ?? false,
        comparisonConditionId: differential?.rule.comparisonConditionId ?? null,
        state: stateDto(differential?.state),
      },
      logRank: {
        enabled: logRank?.rule.enabled ?? false,
        pValueBelow: logRank?.rule.pValueBelow ?? DEFAULT_P_VALUE_BELOW,
        state: stateDto(logRank?.state),
      },
      payDifference: {
        enabled: pay?.rule.enabled ?? false,
        amountMinor: pay?.rule.amountMinor ?? DEFAULT_AMOUNT_MINOR,
        basis: pay?.rule.payBasis ?? 'earned',
        currency: study.currency,
        state: stateDto(pay?.state),
      },
    };
  }

  /** A comparison arm is a condition of the study, or for a within-subjects study an order of them joined by ">". */
  private async requireComparison(
    manager: EntityManager,
    studyId: string,
    design: string,
    comparisonConditionId: string,
  ): Promise<void> {
    const ids = comparisonConditionId.split('>');
    const shapeOk = ids.every((id) => UUID.test(id)) && (design === 'within' ? ids.length >= 2 : ids.length === 1);
    const known =
      shapeOk && (await Promise.all(ids.map((id) => this.studies.hasCondition(studyId, id, manager)))).every(Boolean);
    if (!known) {
      throw new ValidationException([
        {
          field: 'differentialAttrition.comparisonConditionId',
          message:
            design === 'within'
              ? 'must be an order of the study\'s conditions (condition ids joined by ">")'
              : "must be one of the study's conditions",
        },
      ]);
    }
  }

  async put(actor: SessionUser, studyId: string, input: PutAttritionAlertsDto): Promise<AttritionAlertsDto> {
    await this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager, true);
      const comparison = input.differentialAttrition.comparisonConditionId ?? null;
      if (comparison !== null) await this.requireComparison(manager, studyId, study.design, comparison);

      const wanted: Record<
        AlertKind,
        Pick<AttritionAlertRuleEntity, 'enabled' | 'comparisonConditionId' | 'pValueBelow' | 'amountMinor' | 'payBasis'>
      > = {
        'differential-attrition': {
          enabled: input.differentialAttrition.enabled,
          comparisonConditionId: comparison,
          pValueBelow: null,
          amountMinor: null,
          payBasis: null,
        },
        'log-rank': {
          enabled: input.logRank.enabled,
          comparisonConditionId: null,
          pValueBelow: input.logRank.pValueBelow,
          amountMinor: null,
          payBasis: null,
        },
        'pay-difference': {
          enabled: input.payDifference.enabled,
          comparisonConditionId: null,
          pValueBelow: null,
          amountMinor: input.payDifference.amountMinor,
          payBasis: input.payDifference.basis,
        },
      };
      const existing = await this.rulesOf(studyId, manager);
      const changed: Record<string, unknown> = {};
      for (const [kind, values] of Object.entries(wanted) as [AlertKind, (typeof wanted)[AlertKind]][]) {
        const current = existing.find((entry) => entry.rule.kind === kind)?.rule;
        if (current && (Object.keys(values) as (keyof typeof values)[]).every((key) => current[key] === values[key]))
          continue;
        changed[kind] = values;
        const rule = current
          ? await manager.save(Object.assign(current, values, { updatedBy: actor.id }))
          : await manager.save(
              manager.create(AttritionAlertRuleEntity, { studyId, kind, ...values, updatedBy: actor.id }),
            );
        // A changed rule starts afresh: if it is above its new threshold, that is a new crossing.
        await manager.save(
          manager.create(AttritionAlertStateEntity, {
            ruleId: rule.id,
            crossed: false,
            lastValue: null,
            lastThreshold: null,
            evaluatedAt: null,
            crossedAt: null,
            notifiedAt: null,
            crossings: 0,
          }),
        );
      }
      if (Object.keys(changed).length > 0) {
        await this.audit.record(manager, {
          chain: studyId,
          actor,
          action: 'attrition.alerts-updated',
          subjectType: 'study',
          subjectId: studyId,
          data: { changed },
        });
      }
    });
    return this.get(studyId);
  }

  /** Evaluates one study's enabled rules now; called by the scheduled job and directly by tests. */
  async evaluateStudy(studyId: string): Promise<AlertEvaluation> {
    const nothing: AlertEvaluation = { studyId, newlyCrossed: [], backBelow: [], recipients: [], readings: [] };
    const enabled = (await this.rulesOf(studyId)).filter((entry) => entry.rule.enabled);
    if (enabled.length === 0) return nothing;
    const study = await this.studies.require(studyId);
    if (study.status === 'draft') return nothing;

    const differential = enabled.find((entry) => entry.rule.kind === 'differential-attrition')?.rule;
    const figures = await this.figures(studyId, differential?.comparisonConditionId ?? undefined);
    const readings = new Map(
      enabled.map(({ rule }) => [
        rule.id,
        readAlert(toRule(rule), figures.report, figures.earned, study.currency, { plannedSize: study.targetSize }),
      ]),
    );

    return this.dataSource.transaction(async (manager) => {
      // Locked, so that two evaluators (two api instances, or a test beside the job) cannot both send one crossing.
      const locked = await manager.find(AttritionAlertRuleEntity, {
        where: { studyId, enabled: true },
        lock: { mode: 'pessimistic_write' },
      });
      const states = await this.rulesOf(studyId, manager);
      const now = new Date();
      const crossed: { rule: AttritionAlertRuleEntity; reading: AlertReading }[] = [];
      const backBelow: AlertKind[] = [];
      for (const rule of locked) {
        const reading = readings.get(rule.id);
        const before = enabled.find((entry) => entry.rule.id === rule.id)?.rule;
        // Changed while we computed: the next run judges it against its new settings.
        if (!reading || !before || before.updatedAt.getTime() !== rule.updatedAt.getTime()) continue;
        const state =
          states.find((entry) => entry.rule.id === rule.id)?.state ??
          manager.create(AttritionAlertStateEntity, { ruleId: rule.id, crossings: 0 });
        const transition = alertTransition(state.crossed, reading.crossed);
        if (transition === 'crossed') {
          crossed.push({ rule, reading });
          Object.assign(state, {
            crossed: true,
            crossedAt: now,
            notifiedAt: now,
            crossings: (state.crossings ?? 0) + 1,
          });
        } else if (transition === 'back-below') {
          backBelow.push(rule.kind);
          state.crossed = false;
        }
        Object.assign(state, { lastValue: reading.value, lastThreshold: reading.threshold, evaluatedAt: now });
        await manager.save(state);
      }

      const recipients =
        crossed.length === 0
          ? []
          : await this.notify(
              manager,
              study.id,
              study.title,
              crossed.map((entry) => entry.reading),
            );
      for (const { rule, reading } of crossed) {
        await this.audit.record(manager, {
          chain: studyId,
          actor: null,
          action: 'attrition.alert-sent',
          subjectType: 'attrition-alert-rule',
          subjectId: rule.id,
          data: {
            kind: rule.kind,
            value: reading.value,
            threshold: reading.threshold,
            summary: reading.summary,
            recipients,
          },
        });
      }
      return {
        studyId,
        newlyCrossed: crossed.map((entry) => entry.rule.kind),
        backBelow,
        recipients,
        readings: [...readings.values()],
      };
    });
  }

  private async figures(studyId: string, comparisonConditionId: string | undefined): Promise<AttritionFigures> {
    try {
      return (await this.attrition.compute(studyId, comparisonConditionId)).figures;
    } catch (error) {
      // The chosen comparison arm may have no one in it yet (within-subjects orders): fall back to the first condition.
      if (
        comparisonConditionId !== undefined &&
        error instanceof DomainException &&
        error.code === 'VALIDATION_FAILED'
      ) {
        return (await this.attrition.compute(studyId)).figures;
      }
      throw error;
    }
  }

  /** One e-mail per researcher of the study, queued in the caller's transaction; returns their addresses. */
  private async notify(
    manager: EntityManager,
    studyId: string,
    title: string,
    readings: AlertReading[],
  ): Promise<string[]> {
    const members = await this.studies.listMembers(studyId);
    const researchers = members.items.filter((member) => member.role === 'researcher');
    const url = this.watchUrl(studyId);
    for (const researcher of researchers) {
      await this.mail.enqueue(manager, {
        to: researcher.email,
        subject: `Dropout watch: ${title}`,
        text: [
          `Hello ${researcher.name || researcher.email},`,
          '',
          `The dropout watch of "${title}" has crossed a threshold set for it:`,
          '',
          ...readings.map((reading) => `- ${reading.summary}`),
          '',
          `See the numbers behind it: ${url}`,
          '',
          'These flags are screening aids, not the study’s analysis. You will not be e-mailed about the same threshold again until it goes back below and crosses it once more.',
        ].join('\n'),
      });
    }
    return researchers.map((researcher) => researcher.email);
  }

  /** Evaluates every study that has an enabled rule; one study's failure does not stop the others. */
  async evaluateAll(): Promise<{ studies: number; failed: number }> {
    const rows: { study_id: string }[] = await this.dataSource.query(
      `SELECT DISTINCT study_id FROM attrition_alert_rule WHERE enabled`,
    );
    let failed = 0;
    for (const { study_id: studyId } of rows) {
      try {
        await this.evaluateStudy(studyId);
      } catch (error) {
        failed += 1;
        this.logger.error(
          `Alerts of study ${studyId} could not be evaluated: ${error instanceof Error ? error.message : String(error)}`,
        );
      }
    }
    return { studies: rows.length, failed };
  }
}
