import type { INestApplicationContext } from '@nestjs/common';
import { PDFDocument, StandardFonts } from 'pdf-lib';
import { DataSource } from 'typeorm';
import type { SessionUser } from '../../common/auth/session-user';
import { ConsentService } from '../../consent/consent.service';
import { EnrollmentsService } from '../../enrollments/enrollments.service';
import { StepProgressService } from '../../enrollments/step-progress.service';
import { RandomizationService } from '../../randomization/randomization.service';
import type { SchemeMethod } from '../../randomization/scheme-parameters';
import { StepsService } from '../../steps/steps.service';
import { StudiesService } from '../../studies/studies.service';
import { UsersService } from '../../users/users.service';
import { playDemoPayouts } from './play-demo-payouts';
import { DEMO_LAB, DEMO_MEMBERSHIPS, DEMO_STUDIES, DemoStudy, demoParticipantEmail } from './demo-scenario';

const DEMO_CLIENT = { ip: '127.0.0.1', userAgent: 'Evenhand demo loader' };

/** A one-page stand-in for an ethics approval letter, clearly marked as invented demo material. */
async function demoApprovalLetter(study: DemoStudy, reference: string): Promise<Buffer> {
  const pdf = await PDFDocument.create();
  const font = await pdf.embedFont(StandardFonts.Helvetica);
  const page = pdf.addPage([612, 792]);
  const lines = [
    'Harbor Lane Research Ethics Board (invented for the Evenhand demo)',
    '',
    `Approval reference: ${reference}`,
    `Study: ${study.title} (protocol ${study.protocolNumber})`,
    'Decision: approved as a minimal-risk study.',
    '',
    'This letter is demo material and approves nothing.',
  ];
  lines.forEach((line, i) => page.drawText(line, { x: 64, y: 720 - i * 20, size: 12, font }));
  pdf.setCreationDate(new Date('2026-11-20T09:00:00Z'));
  return Buffer.from(await pdf.save());
}

async function activateVersion(consent: ConsentService, actor: SessionUser, studyId: string, study: DemoStudy, reference: string, amend?: (body: string) => string) {
  const draft = await consent.createDraft(actor, studyId, 'consent/minimal-risk-paid-study', {
    ...DEMO_LAB.consentValues,
    contactEmail: study.contactEmail,
    studyPurpose: study.purpose,
  });
  await consent.updateDraft(actor, studyId, draft.id, { approvalReference: reference, approvedAt: '2026-11-20', ...(amend ? { body: amend(draft.body) } : {}) });
  const letter = await demoApprovalLetter(study, reference);
  await consent.uploadApprovalLetter(actor, studyId, draft.id, { buffer: letter, originalname: `${reference}.pdf`, size: letter.length });
  return consent.activate(actor, studyId, draft.id);
}

/**
 * Builds the demo studies through the same services the api uses, so every record, allocation and audit event is
 * real. A study that already exists is left as it is.
 */
export async function buildDemoStudies(app: INestApplicationContext): Promise<string[]> {
  const dataSource = app.get(DataSource);
  const studies = app.get(StudiesService);
  const steps = app.get(StepsService);
  const randomization = app.get(RandomizationService);
  const consent = app.get(ConsentService);
  const enrollments = app.get(EnrollmentsService);
  const stepProgress = app.get(StepProgressService);
  const users = app.get(UsersService);
  const coordinatorEntity = await users.findByEmail('coordinator@evenhand.test');
  if (!coordinatorEntity) throw new Error('load the demo accounts first');
  const coordinator: SessionUser = { id: coordinatorEntity.id, email: coordinatorEntity.email, name: coordinatorEntity.name, role: 'coordinator' };
  const built: string[] = [];

  for (const demo of DEMO_STUDIES) {
    if (await studies.findBySlug(demo.slug)) continue;
    const study = await studies.create(coordinator, {
      slug: demo.slug,
      title: demo.title,
      protocolNumber: demo.protocolNumber,
      design: demo.design,
      summary: demo.summary,
      estimatedMinutes: demo.estimatedMinutes,
      targetSize: demo.targetSize,
      budgetMinor: demo.budgetMinor,
      currency: 'USD',
      blinded: demo.blinded,
      labName: DEMO_LAB.labName,
      contactEmail: demo.contactEmail,
    });
    for (const membership of DEMO_MEMBERSHIPS.filter((m) => m.slug === demo.slug)) {
      await studies.addMember(coordinator, study.id, { email: membership.email, role: membership.role });
    }
    for (const condition of demo.conditions) await studies.createCondition(coordinator, study.id, condition);
    if (demo.factors.length) await studies.replaceFactors(coordinator, study.id, demo.factors);
    await studies.replaceScreeningQuestions(coordinator, study.id, demo.screening);
    for (const step of demo.steps) await steps.create(coordinator, study.id, step);
    const { method, ...settings } = demo.scheme;
    await dataSource.transaction(async (manager) => {
      const snapshot = await studies.designSnapshot(study.id, manager);
      await randomization.saveScheme(manager, coordinator, study.id, method as SchemeMethod, settings, snapshot, false);
    });
    // A study opens only once its consent form is approved and active.
    const first = await activateVersion(consent, coordinator, study.id, demo, demo.approvalReference);
    await studies.transition(coordinator, study.id, 'open');

    const signedUp: SessionUser[] = [];
    for (let i = 0; i < demo.participants.count; i++) {
      const n = demo.participants.first + i;
      const email = demoParticipantEmail(demo.participants.prefix, n);
      const { user } = await dataSource.transaction((manager) => users.findOrCreateParticipant(manager, email));
      const participant: SessionUser = { id: user.id, email: user.email, name: '', role: 'participant' };
      await enrollments.join(participant, study.id);
      const excluded = i < demo.participants.excluded;
      const answers: Record<string, number | string | boolean> = Object.fromEntries(demo.screening.map((q) => [q.key, !(excluded && q.key === 'adult')]));
      // A spread of self-ratings, so both strata fill.
      for (const factor of demo.factors) answers[factor.key] = (n * 37) % 101;
      const screening = await enrollments.submitScreening(participant, study.id, answers);
      if (!screening.eligible) continue;
      await enrollments.sign(participant, study.id, { versionId: first.id, fingerprint: first.fingerprint!, typedName: `Demo Participant ${String(n).padStart(3, '0')}` }, DEMO_CLIENT);
      signedUp.push(participant);
    }

    if (demo.amendment) {
      const amendment = demo.amendment;
      const second = await activateVersion(consent, coordinator, study.id, demo, amendment.approvalReference, (body) =>
        body.replace(/(## What the study is about and what you will do\n(?:<!--[^\n]*-->\n)?)/, `$1\n${amendment.note}\n`),
      );
      for (const participant of signedUp.slice(0, amendment.resign)) {
        await enrollments.sign(participant, study.id, { versionId: second.id, fingerprint: second.fingerprint!, typedName: `Demo Participant (re-signed)` }, DEMO_CLIENT);
      }
    }
    // Only people on the current consent version can go on with their steps; the rest wait to re-consent.
    if (demo.history) await playHistory(app, coordinator, study.id, demo, signedUp.slice(0, demo.amendment?.resign ?? signedUp.length));
    if (demo.pay) await playDemoPayouts(app, coordinator, study.id, demo, signedUp);
    built.push(demo.slug);
  }
  return built;
}

/** A deterministic stand-in for chance, so the demo looks the same on every machine. */
function demoChance(n: number, salt: number): number {
  const x = Math.sin(n * 12.9898 + salt * 78.233) * 43758.5453;
  return x - Math.floor(x);
}

/**
 * Gives the demo study weeks of invented history: people working through their steps, some withdrawing and some
 * lost to follow-up, with one condition losing people faster, so the dropout watch has something to show.
 */
async function playHistory(app: INestApplicationContext, coordinator: SessionUser, studyId: string, demo: DemoStudy, people: SessionUser[]) {
  const dataSource = app.get(DataSource);
  const enrollments = app.get(EnrollmentsService);
  const stepProgress = app.get(StepProgressService);
  const history = demo.history!;
  const rows: Array<{ id: string; internal_name: string }> = await dataSource.query(`SELECT id, internal_name FROM condition WHERE study_id = $1`, [studyId]);
  const internalNameOf = new Map<string, string>(rows.map((c) => [c.id, c.internal_name]));
  const stepIds: string[] = (await dataSource.query(`SELECT id FROM step WHERE study_id = $1 ORDER BY position`, [studyId])).map((r: { id: string }) => r.id);
  const day = 24 * 3600 * 1000;
  const now = Date.now();
  // Who stops is drawn from each person's place within their condition, not from the random allocation's order, so
  // every run of the demo tells the same story (each condition loses someone; "no cues" loses the most).
  const placeInCondition = new Map<string, number>();
  for (const [i, person] of people.entries()) {
    const [row] = await dataSource.query(`SELECT id, condition_id FROM enrollment WHERE study_id = $1 AND participant_id = $2`, [studyId, person.id]);
    const internalName = internalNameOf.get(row.condition_id) ?? '';
    const dropRate = history.dropoutByCondition[internalName] ?? 0.15;
    const place = placeInCondition.get(row.condition_id) ?? 0;
    placeInCondition.set(row.condition_id, place + 1);
    const draw = place + 100 * Math.max(0, demo.conditions.findIndex((c) => c.internalName === internalName));
    const assignedAt = new Date(now - (history.days - (i * history.days) / people.length) * day);
    // Every step of the way, a person may stop; those who stop are withdrawn or, if they went quiet, lost.
    let stepsDone = 0;
    let stoppedAfter: number | null = null;
    for (let s = 0; s < stepIds.length; s++) {
      if (demoChance(draw, s + 1) < dropRate / stepIds.length + (s === 0 ? dropRate / 3 : 0)) {
        stoppedAfter = s;
        break;
      }
      const at = new Date(assignedAt.getTime() + (s + 1) * history.daysBetweenSteps * day);
      if (at.getTime() > now) break;
      await stepProgress.completeByStaff(coordinator, studyId, row.id, stepIds[s]);
      await dataSource.query(`UPDATE step_completion SET completed_at = $1 WHERE enrollment_id = $2 AND step_id = $3`, [at, row.id, stepIds[s]]);
      await dataSource.query(
        `UPDATE payout SET created_at = $1 WHERE step_completion_id = (SELECT id FROM step_completion WHERE enrollment_id = $2 AND step_id = $3)`,
        [at, row.id, stepIds[s]],
      );
      stepsDone += 1;
    }
    const stoppedAt = new Date(assignedAt.getTime() + ((stoppedAfter ?? 0) + 0.5) * history.daysBetweenSteps * day);
    if (stoppedAfter !== null && stoppedAt.getTime() < now) {
      if (demoChance(draw, 99) < 0.5) {
        await enrollments.withdrawOnBehalf(coordinator, studyId, row.id, history.withdrawalReasons[i % history.withdrawalReasons.length]);
        await dataSource.query(`UPDATE enrollment SET withdrew_at = $1 WHERE id = $2`, [stoppedAt, row.id]);
      } else if (stepsDone > 0 || demoChance(draw, 7) < 0.5) {
        await dataSource.query(`UPDATE enrollment SET status = 'active' WHERE id = $1 AND status = 'assigned'`, [row.id]);
        await enrollments.markLost(coordinator, studyId, row.id, 'No reply to three reminders');
        await dataSource.query(`UPDATE enrollment SET lost_at = $1 WHERE id = $2`, [stoppedAt, row.id]);
      }
    }
    const completedAt = new Date(assignedAt.getTime() + stepIds.length * history.daysBetweenSteps * day);
    await dataSource.query(`UPDATE enrollment SET assigned_at = $1, consented_at = $1, completed_at = CASE WHEN status = 'completed' THEN $2::timestamptz END WHERE id = $3`, [
      assignedAt,
      completedAt,
      row.id,
    ]);
  }
}
