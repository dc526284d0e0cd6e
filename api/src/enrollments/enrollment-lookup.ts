import { randomBytes } from 'node:crypto';
import { EntityManager } from 'typeorm';
import type { SessionUser } from '../common/auth/session-user';
import { EnrollmentException } from './enrollment.exception';
import { EnrollmentEntity, EnrollmentStatus } from './entities/enrollment.entity';

/** Statuses in which a person has been randomized (the denominator of attrition). */
export const RANDOMIZED_STATUSES: EnrollmentStatus[] = ['assigned', 'active', 'completed', 'withdrew', 'lost'];
export const CLOSED_STATUSES: EnrollmentStatus[] = ['excluded', 'withdrew', 'lost', 'completed'];

/** The signed-in participant's enrollment in a study, locked for the transaction with `lock`. */
export async function requireMine(
  manager: EntityManager,
  user: SessionUser,
  studyId: string,
  lock = false,
): Promise<EnrollmentEntity> {
  const enrollment = await manager.findOne(EnrollmentEntity, {
    where: { studyId, participantId: user.id },
    ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}),
  });
  if (!enrollment) throw new EnrollmentException('NOT_FOUND', 'You have not joined this study.');
  return enrollment;
}

/** One participant on a study's roster, locked for the staff action that reads it. */
export async function requireOnRoster(
  manager: EntityManager,
  studyId: string,
  enrollmentId: string,
): Promise<EnrollmentEntity> {
  const enrollment = await manager.findOne(EnrollmentEntity, {
    where: { id: enrollmentId, studyId },
    lock: { mode: 'pessimistic_write' },
  });
  if (!enrollment) throw new EnrollmentException('NOT_FOUND', 'No such participant in this study.');
  return enrollment;
}

function newReference(): string {
  // Pseudonymous and short enough to read over the phone; unique per study by index.
  const alphabet = 'ABCDEFGHJKLMNPQRSTUVWXYZ23456789';
  return `P-${[...randomBytes(6)].map((b) => alphabet[b % alphabet.length]).join('')}`;
}

/** A new enrollment under a fresh reference (invited unless `values` say otherwise). */
export async function insertEnrollment(
  manager: EntityManager,
  studyId: string,
  participantId: string,
  values: Partial<EnrollmentEntity>,
): Promise<EnrollmentEntity> {
  for (let attempt = 0; ; attempt++) {
    const reference = newReference();
    const clash = await manager.exists(EnrollmentEntity, { where: { studyId, reference } });
    if (!clash)
      return manager.save(
        manager.create(EnrollmentEntity, { studyId, participantId, reference, status: 'invited', ...values }),
      );
    if (attempt > 5) throw new Error('could not find a free enrollment reference');
  }
}
