import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import { RandomizationService } from '../randomization';
import { StudiesService } from '../studies';
import { UsersService } from '../users';
import { ImportResultDto } from './dto/enrollment.dto';
import { EnrollmentException } from './enrollment.exception';
import { insertEnrollment } from './enrollment-lookup';
import { EnrollmentEntity } from './entities/enrollment.entity';
import { parseRoster } from './roster-import';

/** Building the cohort before anyone signs: importing a roster from CSV, and forming matched pairs. */
@Injectable()
export class CohortService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly studies: StudiesService,
    private readonly randomization: RandomizationService,
    private readonly users: UsersService,
  ) {}

  async importRoster(actor: AuditActor, studyId: string, csv: string): Promise<ImportResultDto> {
    const factors = (await this.studies.designSnapshot(studyId)).factors;
    const parsed = parseRoster(csv, factors);
    let created = 0;
    let alreadyEnrolled = 0;
    await this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager, true);
      if (study.status === 'closed')
        throw new EnrollmentException('STUDY_CLOSED', 'A closed study takes no new participants.');
      for (const row of parsed.rows) {
        const { user } = await this.users.findOrCreateParticipant(manager, row.email);
        if (user.role !== 'participant') {
          parsed.errors.push({ line: row.line, field: 'email', message: `${row.email} belongs to a staff account` });
          continue;
        }
        const exists = await manager.exists(EnrollmentEntity, { where: { studyId, participantId: user.id } });
        if (exists) {
          alreadyEnrolled += 1;
          continue;
        }
        await insertEnrollment(manager, studyId, user.id, {
          covariates: row.covariates,
          displayName: row.name,
          invitedBy: actor.id,
          invitedAt: new Date(),
        });
        created += 1;
      }
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'roster.imported',
        subjectType: 'study',
        subjectId: studyId,
        data: { created, alreadyEnrolled, rowErrors: parsed.errors.length },
      });
    });
    parsed.errors.sort((a, b) => a.line - b.line);
    return { created, alreadyEnrolled, errors: parsed.errors, ignoredColumns: parsed.ignoredColumns };
  }

  /** Matched pairs: everyone on the roster with a pretest who has not consented yet forms the cohort. */
  async pairCohort(
    actor: AuditActor,
    studyId: string,
  ): Promise<{ pairs: number; leftoverEnrollmentId: string | null; cohort: number }> {
    return this.dataSource.transaction(async (manager) => {
      const scheme = await this.randomization.schemeOf(studyId, manager);
      const pretestKey = (scheme?.settings as { pretestKey?: string } | undefined)?.pretestKey;
      if (!pretestKey)
        throw new EnrollmentException(
          'PAIRING_NOT_APPLICABLE',
          'Pairing applies to a study whose scheme is matched pairs.',
        );
      const rows = await manager.find(EnrollmentEntity, { where: { studyId }, order: { createdAt: 'ASC', id: 'ASC' } });
      const cohort = rows
        .filter((e) => ['invited', 'screened'].includes(e.status) && typeof e.covariates[pretestKey] === 'number')
        .map((e) => ({ enrollmentId: e.id, pretest: e.covariates[pretestKey] as number }));
      const result = await this.randomization.pairCohort(manager, actor, studyId, cohort);
      return { ...result, cohort: cohort.length };
    });
  }
}
