import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';
import { AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { ReminderException } from './reminder.exception';
import { AppConfig } from '../config/app-config';
import { renderEmail, type RenderedEmail } from '../consent';
import { formatMoney } from '../consent';
import { StepsService } from '../steps';
import type { StudyEntity } from '../studies';
import { StudiesService } from '../studies';
import { ReminderPlanDto, SaveReminderPlanDto } from './dto/reminders.dto';
import { ReminderPlanEntity } from './entities/reminder-plan.entity';
import { DEFAULT_REMINDER_RULES, ruleKey, type ReminderRule } from './reminder-planner';

export interface ReminderSettings {
  rules: ReminderRule[];
  suggestLostAfter: number;
  enabled: boolean;
  updatedAt: Date | null;
}

const DATE = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });

/** "It opened on 3 March 2026 and is due by 5 March 2026." from the reminder's rule and the step's window. */
export function timingSentence(rule: ReminderRule, opensAt: Date, dueAt: Date | null): string {
  const due = dueAt ? ` and is due by ${DATE.format(dueAt)}` : '';
  if (rule.anchor === 'due' && rule.days === 0) return `It is due today, ${DATE.format(dueAt ?? opensAt)}.`;
  return `It opened on ${DATE.format(opensAt)}${due}.`;
}

/** One plan per study, the same for every condition: a study without a saved plan uses the default rules. */
@Injectable()
export class ReminderPlanService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly studies: StudiesService,
    private readonly steps: StepsService,
    private readonly audit: AuditService,
    private readonly config: AppConfig,
  ) {}

  async settingsOf(studyId: string, manager: EntityManager = this.dataSource.manager): Promise<ReminderSettings> {
    const plan = await manager.findOne(ReminderPlanEntity, { where: { studyId } });
    return plan
      ? { rules: plan.rules, suggestLostAfter: plan.suggestLostAfter, enabled: plan.enabled, updatedAt: plan.updatedAt }
      : { rules: DEFAULT_REMINDER_RULES, suggestLostAfter: 3, enabled: true, updatedAt: null };
  }

  async get(studyId: string): Promise<ReminderPlanDto> {
    const study = await this.studies.require(studyId);
    const settings = await this.settingsOf(studyId);
    const preview = await this.preview(study, settings.rules[0] ?? DEFAULT_REMINDER_RULES[0]);
    return {
      rules: settings.rules,
      suggestLostAfter: settings.suggestLostAfter,
      enabled: settings.enabled,
      updatedAt: settings.updatedAt?.toISOString() ?? null,
      previewSubject: preview.subject,
      previewText: preview.text,
    };
  }

  async save(actor: SessionUser, studyId: string, input: SaveReminderPlanDto): Promise<ReminderPlanDto> {
    const keys = input.rules.map(ruleKey);
    const repeated = keys.findIndex((key, i) => keys.indexOf(key) !== i);
    if (repeated >= 0)
      throw new ReminderException('VALIDATION_FAILED', 'Each reminder may appear once.', [
        { field: `rules.${repeated}`, message: 'repeats an earlier reminder' },
      ]);
    await this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager, true);
      if (study.status === 'closed')
        throw new ReminderException('STUDY_SEALED', 'A closed study is sealed and cannot change.');
      const rules = input.rules.map((r) => ({ anchor: r.anchor, days: r.days }));
      await manager.query(
        `INSERT INTO reminder_plan (study_id, rules, suggest_lost_after, enabled, updated_by, updated_at) VALUES ($1, $2, $3, $4, $5, now())
         ON CONFLICT (study_id) DO UPDATE SET rules = EXCLUDED.rules, suggest_lost_after = EXCLUDED.suggest_lost_after, enabled = EXCLUDED.enabled,
           updated_by = EXCLUDED.updated_by, updated_at = now()`,
        [studyId, JSON.stringify(rules), input.suggestLostAfter, input.enabled, actor.id],
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'reminders.plan-saved',
        subjectType: 'study',
        subjectId: studyId,
        data: { rules, suggestLostAfter: input.suggestLostAfter, enabled: input.enabled },
      });
    });
    return this.get(studyId);
  }

  /** The reminder e-mail for one step and rule, as the participant receives it. */
  async render(
    study: StudyEntity,
    input: {
      participantName: string | null;
      stepTitle: string;
      stepPayMinor: number;
      rule: ReminderRule;
      opensAt: Date;
      dueAt: Date | null;
    },
  ): Promise<RenderedEmail> {
    return renderEmail('email/step-reminder', {
      participantName: input.participantName,
      studyTitle: study.title,
      labName: study.labName || 'The research team',
      investigatorName: study.labName || 'The research team',
      contactEmail: study.contactEmail ?? this.config.mailFrom,
      portalUrl: new URL(`/s/${study.slug}`, this.config.portalUrl).toString(),
      stepTitle: input.stepTitle,
      timingSentence: timingSentence(input.rule, input.opensAt, input.dueAt),
      stepPay: formatMoney(input.stepPayMinor, study.currency),
    });
  }

  private async preview(study: StudyEntity, rule: ReminderRule): Promise<RenderedEmail> {
    const first = (await this.steps.list(study.id)).items[0];
    const opensAt = new Date();
    const dueAt = first?.dueWithinDays != null ? new Date(opensAt.getTime() + first.dueWithinDays * 86_400_000) : null;
    return this.render(study, {
      participantName: 'Alex',
      stepTitle: first?.title ?? 'Your first step',
      stepPayMinor: first?.payMinor ?? 0,
      rule,
      opensAt,
      dueAt,
    });
  }
}
