import type { INestApplicationContext } from '@nestjs/common';
import { DataSource } from 'typeorm';
import type { SessionUser } from '../common/auth/session-user';
import type { CovariateRecord } from '../randomization/randomization.service';
import { RandomizationService } from '../randomization/randomization.service';
import type { SchemeMethod } from '../randomization/scheme-parameters';
import type { SchemeSettings, StudyDesignSnapshot } from '../randomization/study-design-snapshot';
import { StepsService } from '../steps/steps.service';
import { activateBenchConsent } from './bench-consent';
import { StudiesService } from '../studies/studies.service';

/** Pretest scores at or above this fall in the upper stratum: one numeric factor, so two strata. */
export const PRETEST_CUT = 65;

/** The design every benchmark study has, added as a researcher would: two conditions and the pretest factor. */
export async function addBenchDesign(studies: StudiesService, researcher: SessionUser, studyId: string): Promise<void> {
  for (const name of ['cue-a', 'cue-b']) {
    await studies.createCondition(researcher, studyId, {
      internalName: name,
      participantLabel: `Route guide ${name.slice(-1).toUpperCase()}`,
    });
  }
  await studies.replaceFactors(researcher, studyId, [
    { key: 'pretest', label: 'Pretest score (0–100)', kind: 'numeric', cutPoints: [PRETEST_CUT] },
  ]);
}

/** The schemes measured, with the researcher's settings for each. */
export const BENCH_SCHEMES: Record<'stratified-blocks' | 'minimization', SchemeSettings> = {
  'stratified-blocks': { blockSizes: [2, 4] },
  minimization: {},
};

export interface BenchEnrollment {
  enrollmentId: string;
  covariates: CovariateRecord;
}

export interface BenchStudy {
  studyId: string;
  enrollments: BenchEnrollment[];
}

/**
 * Sets studies up through the same services the admin screens call: a researcher creates the study, adds two
 * conditions and a pretest factor, chooses the scheme and opens it (which seals the seed); consented
 * enrollments are then written directly, as the roster import will.
 */
export class BenchStudies {
  private readonly dataSource: DataSource;
  private readonly studies: StudiesService;
  private readonly randomization: RandomizationService;
  private researcher: SessionUser | null = null;
  private created = 0;

  constructor(private readonly app: INestApplicationContext) {
    this.dataSource = app.get(DataSource);
    this.studies = app.get(StudiesService);
    this.randomization = app.get(RandomizationService);
  }

  async open(method: keyof typeof BENCH_SCHEMES, arrivals: number): Promise<BenchStudy> {
    const researcher = await this.benchResearcher();
    this.created += 1;
    const study = await this.studies.create(researcher, {
      slug: `bench-${method}-${this.created}`,
      title: `Benchmark study ${this.created} (${method})`,
      design: 'between',
      // What the consent form states (protocol, lab, duration); without them activation refuses the form.
      protocolNumber: `BENCH-${method}-${this.created}`,
      labName: 'Quillmoor Benchmark Lab (invented)',
      estimatedMinutes: 30,
      targetSize: arrivals,
    });
    await addBenchDesign(this.studies, researcher, study.id);
    await this.saveScheme(researcher, study.id, method, BENCH_SCHEMES[method]);
    await this.app.get(StepsService).create(researcher, study.id, { title: 'Session 1', payMinor: 1000 });
    await activateBenchConsent(this.app, researcher, study.id, `QREB-ALLOC-${this.created}`);
    await this.studies.transition(researcher, study.id, 'open');
    return { studyId: study.id, enrollments: await this.insertEnrollments(study.id, arrivals) };
  }

  designSnapshot(studyId: string): Promise<StudyDesignSnapshot> {
    return this.studies.designSnapshot(studyId);
  }

  /** As `PUT /studies/:id/assignment-scheme` does it, in one transaction. */
  private async saveScheme(
    actor: SessionUser,
    studyId: string,
    method: SchemeMethod,
    settings: SchemeSettings,
  ): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      await this.studies.require(studyId, manager, true);
      const snapshot = await this.studies.designSnapshot(studyId, manager);
      await this.randomization.saveScheme(manager, actor, studyId, method, settings, snapshot, false);
    });
  }

  /** Participants with pretest scores spread over 0–99, so both strata fill (65 % below the cut, 35 % at or above). */
  private async insertEnrollments(studyId: string, count: number): Promise<BenchEnrollment[]> {
    const rows: Array<{ id: string; covariates: CovariateRecord; reference: string }> = await this.dataSource.query(
      `WITH arrival AS (
         SELECT g AS n, format('bench-%s-%s@example.test', $1::text, g) AS email, (g * 37) % 100 AS pretest
         FROM generate_series(1, $2::int) g
       ), participant AS (
         INSERT INTO user_account (email, role) SELECT email, 'participant' FROM arrival RETURNING id, email
       )
       INSERT INTO enrollment (study_id, participant_id, reference, status, covariates, consented_at)
       SELECT $1::uuid, participant.id, format('B-%s', lpad(arrival.n::text, 6, '0')), 'consented',
              jsonb_build_object('pretest', arrival.pretest), now()
       FROM arrival JOIN participant USING (email)
       RETURNING id, covariates, reference`,
      [studyId, count],
    );
    return rows
      .sort((a, b) => (a.reference < b.reference ? -1 : 1))
      .map((row) => ({ enrollmentId: row.id, covariates: row.covariates }));
  }

  private async benchResearcher(): Promise<SessionUser> {
    if (this.researcher) return this.researcher;
    const [row] = await this.dataSource.query(
      `INSERT INTO user_account (email, name, role) VALUES ('bench-researcher@evenhand.test', 'Bench Researcher', 'researcher') RETURNING id, email, name, role`,
    );
    this.researcher = row as SessionUser;
    return this.researcher;
  }
}
