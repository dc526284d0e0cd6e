import type { INestApplicationContext } from '@nestjs/common';
import { DataSource } from 'typeorm';
import type { SessionUser } from '../../common/auth/session-user';
import { AppConfig } from '../../config/app-config';
import { renderEmail } from '../../consent/consent-emails';
import { formatDuration, formatMoney } from '../../consent/study-formatting';
import { WithdrawalService } from '../../enrollments/withdrawal.service';
import { StepProgressService } from '../../enrollments/step-progress.service';
import { ContactsService } from '../../reminders/contacts.service';
import { ReminderPlanService } from '../../reminders/reminder-plan.service';
import { planReminders } from '../../reminders/reminder-planner';
import { addDays, stepWindows, type StepVerification, type StepWindow } from '../../steps/step-window';
import { StepsService } from '../../steps/steps.service';
import { StudiesService } from '../../studies/studies.service';
import type { DemoStudy } from './demo-scenario';

const DAY_MS = 24 * 3600 * 1000;
const DEMO_CLIENT = { ip: '127.0.0.1', userAgent: 'Evenhand demo loader' };

/** A deterministic stand-in for chance, so the demo looks the same on every machine. */
export function demoChance(n: number, salt: number): number {
  const x = Math.sin(n * 12.9898 + salt * 78.233) * 43758.5453;
  return x - Math.floor(x);
}

/**
 * Gives a demo study weeks of invented history through the real services: each person invited, then assigned on a
 * day spread over `history.days`, doing each step inside its window (by the step's own verification: the return link
 * for task steps, staff for the rest), some withdrawing and some lost to follow-up, with one condition losing people
 * faster; and the reminders each would have been sent under the study's plan up to when they stopped (or now), so
 * the dropout watch has steps, dropouts and contacts to compare by condition.
 */
export async function playDemoHistory(
  app: INestApplicationContext,
  coordinator: SessionUser,
  studyId: string,
  demo: DemoStudy,
  people: SessionUser[],
): Promise<void> {
  const history = demo.history;
  if (!history) return;
  const dataSource = app.get(DataSource);
  const withdrawal = app.get(WithdrawalService);
  const stepProgress = app.get(StepProgressService);
  const steps = app.get(StepsService);
  const contacts = app.get(ContactsService);
  const plans = app.get(ReminderPlanService);
  const config = app.get(AppConfig);
  const study = await app.get(StudiesService).require(studyId);
  const schedules = await steps.schedulesOf(studyId);
  const stepList = (await steps.list(studyId)).items;
  const { rules } = await plans.settingsOf(studyId);
  const invitation = renderEmail('email/study-invitation', {
    participantName: null,
    studyTitle: study.title,
    labName: study.labName || 'The research team',
    investigatorName: study.labName || 'The research team',
    contactEmail: study.contactEmail ?? config.mailFrom,
    portalUrl: new URL(`/s/${study.slug}`, config.portalUrl).toString(),
    institutionName: study.labName || 'our institution',
    studySummary: study.summary || study.title,
    estimatedDuration: study.estimatedMinutes ? formatDuration(study.estimatedMinutes) : 'a short time',
    stepsPhrase: `${stepList.length} steps`,
    totalPay: formatMoney(
      stepList.reduce((sum, s) => sum + s.payMinor, 0),
      study.currency,
    ),
  });
  const conditions: Array<{ id: string; internal_name: string }> = await dataSource.query(
    `SELECT id, internal_name FROM condition WHERE study_id = $1`,
    [studyId],
  );
  const internalNameOf = new Map(conditions.map((c) => [c.id, c.internal_name]));
  const now = new Date();
  // Who stops is drawn from each person's place within their condition, not from the random allocation's order, so
  // every run of the demo tells the same story (each condition loses someone; "no cues" loses the most).
  const placeInCondition = new Map<string, number>();

  for (const [i, person] of people.entries()) {
    const [row]: Array<{ id: string; condition_id: string; reference: string }> = await dataSource.query(
      `SELECT id, condition_id, reference FROM enrollment WHERE study_id = $1 AND participant_id = $2`,
      [studyId, person.id],
    );
    const internalName = internalNameOf.get(row.condition_id) ?? '';
    const dropRate = history.dropoutByCondition[internalName] ?? 0.15;
    const place = placeInCondition.get(row.condition_id) ?? 0;
    placeInCondition.set(row.condition_id, place + 1);
    const draw =
      place +
      100 *
        Math.max(
          0,
          demo.conditions.findIndex((c) => c.internalName === internalName),
        );

    // Assigned first, so every window below counts from the invented day and each completion finds its step open.
    const assignedAt = new Date(now.getTime() - (history.days - (i * history.days) / people.length) * DAY_MS);
    const invitedAt = addDays(assignedAt, -(1 + demoChance(draw, 50)));
    await dataSource.query(
      `UPDATE enrollment SET assigned_at = $1, consented_at = $1, invitation_sent_at = $2, invited_by = $3 WHERE id = $4`,
      [assignedAt, invitedAt, coordinator.id, row.id],
    );

    const done = new Map<string, Date>();
    let stoppedBefore: number | null = null;
    for (const [s, schedule] of schedules.entries()) {
      if (demoChance(draw, s + 1) < dropRate / schedules.length + (s === 0 ? dropRate / 3 : 0)) {
        stoppedBefore = s;
        break;
      }
      const window = stepWindows(schedules, assignedAt, done)[s];
      // Done a little after it opens and before it is due (three days when it has no due date).
      const span =
        (window.dueAt ? window.dueAt.getTime() - window.opensAt!.getTime() : 3 * DAY_MS) *
        (0.1 + 0.75 * demoChance(draw, 40 + s));
      const at = new Date(window.opensAt!.getTime() + span);
      if (at > now) break;
      await completeAsVerified(
        stepProgress,
        steps,
        coordinator,
        person,
        studyId,
        row,
        stepList[s].verification,
        schedule.id,
      );
      await dataSource.query(
        `UPDATE step_completion SET completed_at = $1 WHERE enrollment_id = $2 AND step_id = $3 AND undone_at IS NULL`,
        [at, row.id, schedule.id],
      );
      await dataSource.query(
        `UPDATE payout SET created_at = $1 WHERE step_completion_id = (SELECT id FROM step_completion WHERE enrollment_id = $2 AND step_id = $3 AND undone_at IS NULL)`,
        [at, row.id, schedule.id],
      );
      done.set(schedule.id, at);
    }
    await dataSource.query(
      `UPDATE enrollment SET completed_at = CASE WHEN status = 'completed' THEN $1::timestamptz END WHERE id = $2`,
      [done.size ? new Date(Math.max(...[...done.values()].map((d) => d.getTime()))) : null, row.id],
    );

    // Someone who stops withdraws a day into the step's window, or goes quiet and is marked lost once it is overdue.
    let stoppedAt: Date | null = null;
    if (stoppedBefore !== null) {
      const window = stepWindows(schedules, assignedAt, done)[stoppedBefore];
      const withdraws = demoChance(draw, 99) < 0.5;
      const marksLost = !withdraws && (done.size > 0 || demoChance(draw, 7) < 0.5);
      const at = withdraws ? addDays(window.opensAt!, 1) : addDays(window.dueAt ?? addDays(window.opensAt!, 7), 2);
      if ((withdraws || marksLost) && at < now) {
        stoppedAt = at;
        if (withdraws) {
          await withdrawal.withdrawOnBehalf(
            coordinator,
            studyId,
            row.id,
            history.withdrawalReasons[i % history.withdrawalReasons.length],
          );
          await dataSource.query(`UPDATE enrollment SET withdrew_at = $1 WHERE id = $2`, [at, row.id]);
        } else {
          await dataSource.query(`UPDATE enrollment SET status = 'active' WHERE id = $1 AND status = 'assigned'`, [
            row.id,
          ]);
          await withdrawal.markLost(coordinator, studyId, row.id, 'No reply to the reminders');
          await dataSource.query(`UPDATE enrollment SET lost_at = $1 WHERE id = $2`, [at, row.id]);
        }
      }
    }

    // The contacts: the invitation, then every reminder the plan gave for a step before it was done, up to the
    // moment they stopped or now. The dedupe keys are the sweep's own, so the running api never sends these again.
    const until = stoppedAt ?? now;
    const windows = stepWindows(schedules, assignedAt, done);
    const owed = planReminders(rules, { windows, doneStepIds: new Set() }).filter((r) => {
      const doneAt = done.get(r.stepId);
      return r.sendAt <= until && (!doneAt || r.sendAt < doneAt);
    });
    await dataSource.transaction(async (manager) => {
      await contacts.log(manager, {
        studyId,
        enrollmentId: row.id,
        kind: 'invitation',
        subject: invitation.subject,
        sentBy: coordinator.id,
        sentAt: invitedAt,
      });
      for (const reminder of owed) {
        const s = schedules.findIndex((schedule) => schedule.id === reminder.stepId);
        const window: StepWindow = windows[s];
        const email = await plans.render(study, {
          participantName: null,
          stepTitle: schedules[s].title,
          stepPayMinor: stepList[s].payMinor,
          rule: reminder.rule,
          opensAt: window.opensAt!,
          dueAt: window.dueAt,
        });
        await contacts.log(manager, {
          studyId,
          enrollmentId: row.id,
          kind: 'reminder',
          subject: email.subject,
          stepId: reminder.stepId,
          dedupeKey: reminder.dedupeKey,
          sentAt: reminder.sendAt,
        });
      }
    });
  }
}

/** Completes one step the way its verification works: through the signed return link, or marked by staff. */
async function completeAsVerified(
  stepProgress: StepProgressService,
  steps: StepsService,
  coordinator: SessionUser,
  participant: SessionUser,
  studyId: string,
  enrollment: { id: string; reference: string },
  verification: StepVerification,
  stepId: string,
): Promise<void> {
  if (verification !== 'return-link') {
    await stepProgress.completeByStaff(coordinator, studyId, enrollment.id, stepId);
    return;
  }
  const address = await steps.taskAddress({
    studyId,
    stepId,
    enrollmentId: enrollment.id,
    reference: enrollment.reference,
    dueAt: null,
    now: new Date(),
  });
  const token = new URL(address).searchParams.get('token') ?? '';
  const result = await stepProgress.completeFromReturnLink(token, participant, DEMO_CLIENT);
  if (result.outcome !== 'done')
    throw new Error(`demo return link for ${enrollment.reference} was not accepted: ${JSON.stringify(result)}`);
}
