import { Injectable, Logger, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { AppConfig } from '../config/app-config';
import { JOB_NAMES, JobQueueService } from '../jobs/job-queue.service';
import { MailService } from '../mail/mail.service';
import { StepsService } from '../steps';
import { stepWindows } from '../steps';
import { StudiesService } from '../studies';
import { ContactsService } from './contacts.service';
import { planReminders, remindersDue } from './reminder-planner';
import { ReminderPlanService } from './reminder-plan.service';
import { reminderCandidates, type ReminderCandidate } from './reminders.read-model';

export interface ReminderSweepPayload {
  /** Sweep as if it were this moment (ISO 8601); the scheduled job leaves it out. */
  asOf?: string;
  studyIds?: string[];
}

/**
 * Sends the reminders that are due, study by study, from each study's one plan. A reminder is logged as a contact
 * with a key per enrollment, step and rule, in the same transaction as its e-mail job, so running the sweep again
 * (or twice at once) never sends it twice.
 */
@Injectable()
export class ReminderSweepService implements OnModuleInit {
  private readonly logger = new Logger('Reminders');

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly jobs: JobQueueService,
    private readonly plans: ReminderPlanService,
    private readonly contacts: ContactsService,
    private readonly steps: StepsService,
    private readonly studies: StudiesService,
    private readonly mail: MailService,
    private readonly config: AppConfig,
  ) {}

  async onModuleInit(): Promise<void> {
    await this.jobs.handle<ReminderSweepPayload>(JOB_NAMES.sweepReminders, async (payload) => {
      const sent = await this.sweep(payload.asOf ? new Date(payload.asOf) : new Date(), payload.studyIds);
      if (sent > 0) this.logger.log(`sent ${sent} reminders`);
    });
    // An empty cron turns the schedule off (the test suites sweep at moments of their own choosing).
    if (this.config.reminderSweepCron)
      await this.jobs.schedule(JOB_NAMES.sweepReminders, this.config.reminderSweepCron);
    else await this.jobs.unschedule(JOB_NAMES.sweepReminders);
  }

  /** Sends what is due at `now`; returns how many reminders went out. */
  async sweep(now: Date, studyIds?: string[]): Promise<number> {
    const candidates = await reminderCandidates(this.dataSource.manager, studyIds);
    const byStudy = new Map<string, ReminderCandidate[]>();
    for (const candidate of candidates)
      byStudy.set(candidate.studyId, [...(byStudy.get(candidate.studyId) ?? []), candidate]);
    let sent = 0;
    for (const [studyId, people] of byStudy) sent += await this.sweepStudy(studyId, people, now);
    return sent;
  }

  private async sweepStudy(studyId: string, people: ReminderCandidate[], now: Date): Promise<number> {
    const settings = await this.plans.settingsOf(studyId);
    if (!settings.enabled || settings.rules.length === 0) return 0;
    const schedules = await this.steps.schedulesOf(studyId);
    if (schedules.length === 0) return 0;
    const pay = new Map((await this.steps.list(studyId)).items.map((s) => [s.id, s.payMinor]));
    const completions = await this.steps.completionTimesOf(people.map((p) => p.enrollmentId));
    let sent = 0;
    await this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager);
      for (const person of people) {
        const done = completions.get(person.enrollmentId) ?? new Map<string, Date>();
        const windows = stepWindows(schedules, person.assignedAt, done);
        for (const reminder of remindersDue(
          planReminders(settings.rules, { windows, doneStepIds: new Set(done.keys()) }),
          now,
        )) {
          const step = schedules.find((s) => s.id === reminder.stepId)!;
          const window = windows.find((w) => w.stepId === reminder.stepId)!;
          const email = await this.plans.render(study, {
            participantName: person.displayName,
            stepTitle: step.title,
            stepPayMinor: pay.get(step.id) ?? 0,
            rule: reminder.rule,
            opensAt: window.opensAt!,
            dueAt: window.dueAt,
          });
          const logged = await this.contacts.log(manager, {
            studyId,
            enrollmentId: person.enrollmentId,
            kind: 'reminder',
            subject: email.subject,
            stepId: step.id,
            dedupeKey: reminder.dedupeKey,
            sentAt: now,
          });
          if (!logged) continue;
          await this.mail.enqueue(manager, {
            to: person.email,
            subject: email.subject,
            text: email.text,
            html: email.html,
          });
          sent += 1;
        }
      }
    });
    return sent;
  }
}
