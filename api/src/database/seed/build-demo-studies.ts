import type { INestApplicationContext } from '@nestjs/common';
import { PDFDocument, StandardFonts } from 'pdf-lib';
import { DataSource } from 'typeorm';
import type { SessionUser } from '../../common/auth/session-user';
import { ConsentService } from '../../consent/consent.service';
import { ParticipationService } from '../../enrollments/participation.service';
import { SigningService } from '../../enrollments/signing.service';
import { RandomizationService } from '../../randomization/randomization.service';
import { ReminderPlanService } from '../../reminders/reminder-plan.service';
import type { SchemeMethod } from '../../randomization/scheme-parameters';
import { StepsService } from '../../steps/steps.service';
import { StudiesService } from '../../studies/studies.service';
import { UsersService } from '../../users/users.service';
import { playDemoHistory } from './play-demo-history';
import { playDemoPayouts } from './play-demo-payouts';
import {
  DEMO_LAB,
  DEMO_MEMBERSHIPS,
  DEMO_STUDIES,
  DemoStudy,
  demoParticipantEmail,
  demoTaskAddress,
} from './demo-scenario';

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

async function activateVersion(
  consent: ConsentService,
  actor: SessionUser,
  studyId: string,
  study: DemoStudy,
  reference: string,
  amend?: (body: string) => string,
) {
  const draft = await consent.createDraft(actor, studyId, 'consent/minimal-risk-paid-study', {
    ...DEMO_LAB.consentValues,
    contactEmail: study.contactEmail,
    studyPurpose: study.purpose,
  });
  await consent.updateDraft(actor, studyId, draft.id, {
    approvalReference: reference,
    approvedAt: '2026-11-20',
    ...(amend ? { body: amend(draft.body) } : {}),
  });
  const letter = await demoApprovalLetter(study, reference);
  await consent.uploadApprovalLetter(actor, studyId, draft.id, {
    buffer: letter,
    originalname: `${reference}.pdf`,
    size: letter.length,
  });
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
  const participation = app.get(ParticipationService);
  const signing = app.get(SigningService);
  const reminderPlans = app.get(ReminderPlanService);
  const users = app.get(UsersService);
  const coordinatorEntity = await users.findByEmail('coordinator@evenhand.test');
  if (!coordinatorEntity) throw new Error('load the demo accounts first');
  const coordinator: SessionUser = {
    id: coordinatorEntity.id,
    email: coordinatorEntity.email,
    name: coordinatorEntity.name,
    role: 'coordinator',
  };
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
    // The board's approval reference sits beside the lab's protocol number, labelled apart.
    await studies.update(coordinator, study.id, { ethicsApprovalReference: demo.approvalReference });
    for (const membership of DEMO_MEMBERSHIPS.filter((m) => m.slug === demo.slug)) {
      await studies.addMember(coordinator, study.id, { email: membership.email, role: membership.role });
    }
    for (const condition of demo.conditions) await studies.createCondition(coordinator, study.id, condition);
    if (demo.factors.length) await studies.replaceFactors(coordinator, study.id, demo.factors);
    await studies.replaceScreeningQuestions(coordinator, study.id, demo.screening);
    for (const step of demo.steps) {
      const { items } = await steps.create(coordinator, study.id, {
        title: step.title,
        description: step.description,
        payMinor: step.payMinor,
      });
      await steps.saveSettings(coordinator, study.id, items[items.length - 1].id, {
        verification: step.verification,
        taskUrl: step.task ? demoTaskAddress(step.task) : null,
        opensAfterDays: step.opensAfterDays,
        opensFrom: step.opensFrom,
        dueWithinDays: step.dueWithinDays,
      });
    }
    await reminderPlans.save(coordinator, study.id, { ...demo.reminders, enabled: true });
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
      await participation.join(participant, study.id);
      const excluded = i < demo.participants.excluded;
      const answers: Record<string, number | string | boolean> = Object.fromEntries(
        demo.screening.map((q) => [q.key, !(excluded && q.key === 'adult')]),
      );
      // A spread of self-ratings, so both strata fill.
      for (const factor of demo.factors) answers[factor.key] = (n * 37) % 101;
      const screening = await participation.submitScreening(participant, study.id, answers);
      if (!screening.eligible) continue;
      await signing.sign(
        participant,
        study.id,
        {
          versionId: first.id,
          fingerprint: first.fingerprint!,
          typedName: `Demo Participant ${String(n).padStart(3, '0')}`,
        },
        DEMO_CLIENT,
      );
      signedUp.push(participant);
    }

    if (demo.amendment) {
      const amendment = demo.amendment;
      const second = await activateVersion(consent, coordinator, study.id, demo, amendment.approvalReference, (body) =>
        body.replace(
          /(## What the study is about and what you will do\n(?:<!--[^\n]*-->\n)?)/,
          `$1\n${amendment.note}\n`,
        ),
      );
      for (const participant of signedUp.slice(0, amendment.resign)) {
        await signing.sign(
          participant,
          study.id,
          { versionId: second.id, fingerprint: second.fingerprint!, typedName: `Demo Participant (re-signed)` },
          DEMO_CLIENT,
        );
      }
    }
    // Only people on the current consent version can go on with their steps; the rest wait to re-consent.
    if (demo.history)
      await playDemoHistory(
        app,
        coordinator,
        study.id,
        demo,
        signedUp.slice(0, demo.amendment?.resign ?? signedUp.length),
      );
    if (demo.pay) await playDemoPayouts(app, coordinator, study.id, demo, signedUp);
    if (demo.closedAndArchived) {
      await studies.transition(coordinator, study.id, 'close');
      await studies.setArchived(coordinator, study.id, true);
    }
    built.push(demo.slug);
  }
  return built;
}
