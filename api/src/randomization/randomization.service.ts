import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';
import { AuditActor, AuditService } from '../audit';
import { RandomizationException } from './randomization.exception';
import { computeCommitment } from './commitment';
import {
  deriveSequence,
  generateSlots,
  RecordedAllocation,
  slotStratumKey,
  usesSlots,
  verifyAllocations,
  VerificationReport,
} from './derive-sequence';
import { DryRunResult, runDryRun, CovariateDistribution } from './dry-run';
import { AllocationSlotEntity } from './entities/allocation-slot.entity';
import { AllocationEntity } from './entities/allocation.entity';
import { AssignmentSchemeEntity } from './entities/assignment-scheme.entity';
import {
  isWithinDesign,
  parseParametersOf,
  parseSchemeParameters,
  SchemeMethod,
  SchemeParameters,
} from './scheme-parameters';
import { assignMatchedPairs } from './schemes/matched-pairs';
import { assignByMinimization, emptyTallyOf, MinimizationTally } from './schemes/minimization';
import { generateSeed } from './seeded-stream';

import { buildSchemeParameters, SchemeSettings, StudyDesignSnapshot } from './study-design-snapshot';
import type { AllocationSlot } from './schemes/allocation-slot';
import type { OrderSlot } from './within/order-sequence';

/** Covariates as stored: answers by key, numbers or categories. */
export type CovariateRecord = Record<string, number | string | null>;

export interface EnrollmentMismatch {
  enrollmentId: string;
  reason: 'differs-from-allocation' | 'no-allocation' | 'allocation-of-another-study';
  enrollment: { conditionId: string | null; order: string[] | null };
  allocation: { conditionId: string | null; order: string[] | null } | null;
  /** What the re-derived sequence gives this enrollment, when it is in the sequence. */
  expected: { conditionId: string | null; order: string[] | null } | null;
}

export type AssignmentVerification = Omit<VerificationReport, 'checks'> & {
  commitmentMatches: boolean;
  seed: string;
  commitment: string;
  checks: Array<VerificationReport['checks'][number] & { enrollmentMatches: boolean }>;
  enrollmentMismatches: EnrollmentMismatch[];
};

/** Slots are generated ahead in batches of this many per stratum, deterministically from the seed. */
const SLOT_BATCH = 64;

interface SealedScheme {
  parameters: SchemeParameters;
  seed: string;
  commitment: string;
}

export interface AllocationOutcome {
  conditionId: string | null;
  conditionOrder: string[] | null;
  stratumKey: string;
  sequence: number;
  slotPosition: number | null;
}

export interface AssignmentOverview {
  method: string | null;
  settings: SchemeSettings;
  commitment: string | null;
  committedAt: Date | null;
  seed: string | null;
  seedRevealedAt: Date | null;
  unblindedAt: Date | null;
  unblindReason: string | null;
  allocated: number;
  balance: Array<{ stratumKey: string; total: number; counts: Record<string, number> }>;
}

@Injectable()
export class RandomizationService {
  /** Sealed parameters and seed by study; see sealedScheme. */
  private readonly sealedSchemes = new Map<string, SealedScheme>();
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  async hasAllocations(studyId: string, manager: EntityManager = this.dataSource.manager): Promise<boolean> {
    return manager.exists(AllocationEntity, { where: { studyId } });
  }

  /** How many people have been assigned in this study. */
  async countAllocations(studyId: string, manager: EntityManager = this.dataSource.manager): Promise<number> {
    return manager.count(AllocationEntity, { where: { studyId } });
  }

  async schemeOf(
    studyId: string,
    manager: EntityManager = this.dataSource.manager,
  ): Promise<AssignmentSchemeEntity | null> {
    return manager.findOne(AssignmentSchemeEntity, { where: { studyId } });
  }

  /** Checks settings against the current design without saving (used when the design changes). */
  preview(method: SchemeMethod, settings: SchemeSettings, snapshot: StudyDesignSnapshot): SchemeParameters {
    return buildSchemeParameters(method, settings, snapshot);
  }

  /** Saves the researcher's choice of scheme. Refused once anyone has been assigned. */
  async saveScheme(
    manager: EntityManager,
    actor: AuditActor,
    studyId: string,
    method: SchemeMethod,
    settings: SchemeSettings,
    snapshot: StudyDesignSnapshot,
    studyIsOpen: boolean,
  ): Promise<AssignmentSchemeEntity> {
    await this.refuseIfAllocated(manager, studyId, 'The assignment scheme');
    const parameters = buildSchemeParameters(method, settings, snapshot);
    await manager.upsert(AssignmentSchemeEntity, { studyId, method, settings: settings as never }, ['studyId']);
    await this.audit.record(manager, {
      chain: studyId,
      actor,
      action: 'assignment.scheme-saved',
      subjectType: 'study',
      subjectId: studyId,
      data: { method, settings },
    });
    if (studyIsOpen) await this.commit(manager, actor, studyId, parameters, 'recommitted');
    return (await this.schemeOf(studyId, manager))!;
  }

  /**
   * Seals the scheme when a study opens (or when its design changes before anyone is assigned): draws a fresh
   * 256-bit seed from the OS, freezes the canonical parameters and publishes SHA-256 over both.
   */
  async sealForOpening(
    manager: EntityManager,
    actor: AuditActor,
    studyId: string,
    snapshot: StudyDesignSnapshot,
  ): Promise<void> {
    const scheme = await this.schemeOf(studyId, manager);
    if (!scheme) {
      throw new RandomizationException('SCHEME_MISSING', 'Choose an assignment scheme before opening the study.', [
        { field: 'assignmentScheme', message: 'is not set' },
      ]);
    }
    const parameters = buildSchemeParameters(
      scheme.method as SchemeMethod,
      scheme.settings as SchemeSettings,
      snapshot,
    );
    if (scheme.commitment && (await this.hasAllocations(studyId, manager))) return;
    await this.commit(manager, actor, studyId, parameters, scheme.commitment ? 'recommitted' : 'committed');
  }

  /** After the design changed in an open study with nobody assigned yet: a new seed and commitment. */
  async recommitAfterDesignChange(
    manager: EntityManager,
    actor: AuditActor,
    studyId: string,
    snapshot: StudyDesignSnapshot,
  ): Promise<void> {
    const scheme = await this.schemeOf(studyId, manager);
    if (!scheme?.commitment) return;
    const parameters = buildSchemeParameters(
      scheme.method as SchemeMethod,
      scheme.settings as SchemeSettings,
      snapshot,
    );
    await this.commit(manager, actor, studyId, parameters, 'recommitted');
  }

  private async commit(
    manager: EntityManager,
    actor: AuditActor,
    studyId: string,
    parameters: SchemeParameters,
    how: 'committed' | 'recommitted',
  ): Promise<void> {
    const seed = generateSeed();
    const commitment = computeCommitment(seed, parameters);
    await manager.delete(AllocationSlotEntity, { studyId });
    await manager.update(
      AssignmentSchemeEntity,
      { studyId },
      { sealedParameters: parameters as never, seed, commitment, committedAt: new Date() },
    );
    await this.audit.record(manager, {
      chain: studyId,
      actor,
      action: `assignment.${how}`,
      subjectType: 'study',
      subjectId: studyId,
      data: { commitment, method: parameters.method },
    });
  }

  /** Reveals the seed: at closure, or with an audited unblinding. */
  async revealSeed(
    manager: EntityManager,
    actor: AuditActor,
    studyId: string,
    reason: { kind: 'closed' } | { kind: 'unblinded'; text: string },
  ) {
    const scheme = await this.schemeOf(studyId, manager);
    if (!scheme?.commitment) return;
    const now = new Date();
    if (reason.kind === 'unblinded') {
      if (scheme.unblindedAt)
        throw new RandomizationException('ALREADY_UNBLINDED', 'This study has already been unblinded.');
      await manager.update(
        AssignmentSchemeEntity,
        { studyId },
        {
          unblindedAt: now,
          unblindedBy: actor.id,
          unblindReason: reason.text,
          seedRevealedAt: scheme.seedRevealedAt ?? now,
        },
      );
    } else if (!scheme.seedRevealedAt) {
      await manager.update(AssignmentSchemeEntity, { studyId }, { seedRevealedAt: now });
    }
    const seed = await this.sealedSeed(manager, studyId);
    await this.audit.record(manager, {
      chain: studyId,
      actor,
      action: reason.kind === 'unblinded' ? 'assignment.unblinded' : 'assignment.seed-revealed',
      subjectType: 'study',
      subjectId: studyId,
      data:
        reason.kind === 'unblinded'
          ? { reason: reason.text, seed, commitment: scheme.commitment }
          : { seed, commitment: scheme.commitment },
    });
  }

  private async sealedSeed(manager: EntityManager, studyId: string): Promise<string> {
    const row = await manager
      .createQueryBuilder(AssignmentSchemeEntity, 'scheme')
      .addSelect('scheme.seed')
      .where('scheme.study_id = :studyId', { studyId })
      .getOne();
    if (!row?.seed)
      throw new RandomizationException(
        'SEQUENCE_NOT_SEALED',
        'The study has not been opened, so there is no sealed sequence yet.',
      );
    return row.seed;
  }

  async overview(studyId: string): Promise<AssignmentOverview> {
    const scheme = await this.schemeOf(studyId);
    const rows: Array<{ stratum_key: string; arm: string; n: string }> = await this.dataSource.query(
      `SELECT stratum_key, coalesce(condition_id::text, condition_order::text) AS arm, count(*) AS n
       FROM allocation WHERE study_id = $1 GROUP BY 1, 2 ORDER BY 1, 2`,
      [studyId],
    );
    const byStratum = new Map<string, Record<string, number>>();
    for (const row of rows) {
      const counts = byStratum.get(row.stratum_key) ?? {};
      counts[row.arm] = Number(row.n);
      byStratum.set(row.stratum_key, counts);
    }
    const balance = [...byStratum].map(([stratumKey, counts]) => ({
      stratumKey,
      counts,
      total: Object.values(counts).reduce((a, b) => a + b, 0),
    }));
    const revealed = Boolean(scheme?.seedRevealedAt);
    return {
      method: scheme?.method ?? null,
      settings: (scheme?.settings ?? {}) as SchemeSettings,
      commitment: scheme?.commitment ?? null,
      committedAt: scheme?.committedAt ?? null,
      seed: revealed ? await this.sealedSeed(this.dataSource.manager, studyId) : null,
      seedRevealedAt: scheme?.seedRevealedAt ?? null,
      unblindedAt: scheme?.unblindedAt ?? null,
      unblindReason: scheme?.unblindReason ?? null,
      allocated: balance.reduce((sum, s) => sum + s.total, 0),
      balance,
    };
  }

  /**
   * Assigns one enrollment inside the caller's transaction.
   * Slot schemes claim the lowest free slot of the stratum with FOR UPDATE SKIP LOCKED: no lock is waited on from
   * the claim to the commit, so people signing at once each take a different slot, possibly out of arrival order
   * (see "Slots claimed out of arrival order" in api/README.md for what still holds and what verify checks). If
   * the caller's transaction rolls back, its slot is free again and the next claim in that stratum takes it first.
   * Minimization looks at everyone assigned before, so it keeps one lock for the whole study.
   * Lock order: call this before writing the study's audit events in the same transaction.
   */
  async allocate(
    manager: EntityManager,
    actor: AuditActor,
    input: { studyId: string; enrollmentId: string; covariates: CovariateRecord },
  ): Promise<AllocationOutcome> {
    if (!manager.queryRunner?.isTransactionActive)
      throw new Error('allocate() must run inside the caller’s transaction');
    let sealed = await this.sealedScheme(manager, input.studyId);
    let outcome: AllocationOutcome;
    if (usesSlots(sealed.parameters)) {
      let claim = await this.claimSlot(manager, sealed, input);
      if (claim === 'stale') {
        sealed = await this.sealedScheme(manager, input.studyId, true);
        claim = await this.claimSlot(manager, sealed, input);
      }
      if (claim === 'stale')
        throw new RandomizationException('NOT_OPEN_FOR_ASSIGNMENT', 'This study is not open for assignment yet.');
      if (claim === 'already') {
        const existing = await manager.findOneOrFail(AllocationEntity, { where: { enrollmentId: input.enrollmentId } });
        return this.outcomeOf(existing, null);
      }
      outcome = claim;
    } else {
      const existing = await manager.findOne(AllocationEntity, { where: { enrollmentId: input.enrollmentId } });
      if (existing) return this.outcomeOf(existing, null);
      outcome =
        sealed.parameters.method === 'minimization'
          ? await this.minimize(manager, sealed.seed, sealed.parameters, input)
          : await this.takeReservedSlot(manager, input);
    }
    await this.audit.record(manager, {
      chain: input.studyId,
      actor,
      action: 'assignment.allocated',
      subjectType: 'enrollment',
      subjectId: input.enrollmentId,
      data: { sequence: outcome.sequence, stratumKey: outcome.stratumKey, slotPosition: outcome.slotPosition },
    });
    return outcome;
  }

  /**
   * A study's sealed parameters and seed. Kept in memory per study: both are bound by the commitment, which every
   * slot claim re-checks in the same statement (a changed commitment makes the claim answer 'stale' and this is
   * read again), so the cache can never hand out a slot under parameters that are no longer sealed.
   */
  private async sealedScheme(manager: EntityManager, studyId: string, reload = false): Promise<SealedScheme> {
    const cached = reload ? undefined : this.sealedSchemes.get(studyId);
    if (cached) return cached;
    const [row]: Array<{
      sealed_parameters: Record<string, unknown> | null;
      seed: string | null;
      commitment: string | null;
    }> = await manager.query(`SELECT sealed_parameters, seed, commitment FROM assignment_scheme WHERE study_id = $1`, [
      studyId,
    ]);
    if (!row?.sealed_parameters || !row.commitment || !row.seed) {
      this.sealedSchemes.delete(studyId);
      throw new RandomizationException('NOT_OPEN_FOR_ASSIGNMENT', 'This study is not open for assignment yet.');
    }
    const sealed = {
      parameters: parseSchemeParameters(row.sealed_parameters),
      seed: row.seed,
      commitment: row.commitment,
    };
    if (this.sealedSchemes.size >= 1000) this.sealedSchemes.delete(this.sealedSchemes.keys().next().value!);
    this.sealedSchemes.set(studyId, sealed);
    return sealed;
  }

  /**
   * One statement: skip slots other transactions are claiming, take the lowest free one, record the allocation.
   * Only when the stratum has no free slot left are more generated (under the stratum's lock, rare: once per
   * SLOT_BATCH claims) and the claim tried again.
   */
  private async claimSlot(
    manager: EntityManager,
    sealed: SealedScheme,
    input: { studyId: string; enrollmentId: string; covariates: CovariateRecord },
  ): Promise<AllocationOutcome | 'stale' | 'already'> {
    const stratumKey = slotStratumKey(sealed.parameters, input.covariates);
    const first = await this.claimStatement(manager, sealed, stratumKey, input);
    if (first !== 'none') return first;
    // Every free slot is taken or being claimed: under the stratum's lock, try once more (another transaction may
    // have just generated a batch), else generate the next batch here and claim from it.
    await manager.query(`SELECT pg_advisory_xact_lock(hashtextextended($1, 0))`, [
      `allocation:${input.studyId}:${stratumKey}`,
    ]);
    const second = await this.claimStatement(manager, sealed, stratumKey, input);
    if (second !== 'none') return second;
    await this.generateMoreSlots(manager, sealed.seed, sealed.parameters, input.studyId, stratumKey);
    const third = await this.claimStatement(manager, sealed, stratumKey, input);
    if (third === 'none') throw new Error(`no slot could be claimed in stratum ${stratumKey}`);
    return third;
  }

  private async claimStatement(
    manager: EntityManager,
    sealed: SealedScheme,
    stratumKey: string,
    input: { studyId: string; enrollmentId: string; covariates: CovariateRecord },
  ): Promise<AllocationOutcome | 'stale' | 'already' | 'none'> {
    const [row]: Array<{
      current: boolean;
      already: boolean;
      sequence: number | null;
      position: number | null;
      condition_id: string | null;
      condition_order: string[] | null;
    }> = await manager.query(
      `WITH scheme AS (
           SELECT 1 FROM assignment_scheme WHERE study_id = $1 AND commitment = $5
         ), earlier AS (
           SELECT 1 FROM allocation WHERE enrollment_id = $3
         ), free AS (
           SELECT id FROM allocation_slot
           WHERE study_id = $1 AND stratum_key = $2 AND taken_by IS NULL AND reserved_for IS NULL
             AND EXISTS (SELECT 1 FROM scheme) AND NOT EXISTS (SELECT 1 FROM earlier)
           ORDER BY position LIMIT 1 FOR UPDATE SKIP LOCKED
         ), claimed AS (
           UPDATE allocation_slot slot SET taken_by = $3, taken_at = now() FROM free WHERE slot.id = free.id
           RETURNING slot.id, slot.position, slot.condition_id, slot.condition_order
         ), inserted AS (
           INSERT INTO allocation (study_id, enrollment_id, sequence, stratum_key, covariates, levels, slot_id, condition_id, condition_order)
           SELECT $1, $3, nextval('allocation_sequence'), $2, $4::jsonb, '{}'::jsonb, claimed.id, claimed.condition_id, claimed.condition_order FROM claimed
           RETURNING sequence, slot_id
         )
         SELECT EXISTS (SELECT 1 FROM scheme) AS current, EXISTS (SELECT 1 FROM earlier) AS already,
                inserted.sequence, claimed.position, claimed.condition_id, claimed.condition_order
         FROM (SELECT 1) one LEFT JOIN inserted ON true LEFT JOIN claimed ON claimed.id = inserted.slot_id`,
      [input.studyId, stratumKey, input.enrollmentId, JSON.stringify(input.covariates ?? {}), sealed.commitment],
    );
    if (!row.current) return 'stale';
    if (row.already) return 'already';
    if (row.sequence === null) return 'none';
    return {
      conditionId: row.condition_id,
      conditionOrder: row.condition_order,
      stratumKey,
      sequence: Number(row.sequence),
      slotPosition: Number(row.position),
    };
  }

  /**
   * Generates the stratum's next batch of slots; the caller holds the stratum's lock (to its commit, which only
   * happens at a batch boundary), so the others that ran out wait and then find the new slots.
   */
  private async generateMoreSlots(
    manager: EntityManager,
    seed: string,
    parameters: SchemeParameters,
    studyId: string,
    stratumKey: string,
  ) {
    const [{ n }] = await manager.query(
      `SELECT count(*) AS n FROM allocation_slot WHERE study_id = $1 AND stratum_key = $2`,
      [studyId, stratumKey],
    );
    const existing = Number(n);
    const slots = generateSlots(seed, parameters, stratumKey, existing + SLOT_BATCH).slice(existing) as Array<
      AllocationSlot | OrderSlot
    >;
    await manager.insert(
      AllocationSlotEntity,
      slots.map((slot) => ({
        studyId,
        stratumKey,
        position: slot.position,
        conditionId: 'order' in slot ? null : slot.conditionId,
        conditionOrder: 'order' in slot ? slot.order : null,
        orderIndex: 'order' in slot ? slot.orderIndex : null,
        blockIndex: slot.blockIndex,
      })),
    );
  }

  private async minimize(
    manager: EntityManager,
    seed: string,
    parameters: Extract<SchemeParameters, { method: 'minimization' }>,
    input: { studyId: string; enrollmentId: string; covariates: CovariateRecord },
  ): Promise<AllocationOutcome> {
    // Minimization looks at everyone assigned so far, so the whole study is one stratum for locking.
    await manager.query(`SELECT pg_advisory_xact_lock(hashtextextended($1, 0))`, [`allocation:${input.studyId}:*`]);
    const tally = await this.minimizationTally(manager, input.studyId, parameters);
    const decision = assignByMinimization({
      seed,
      parameters,
      arrivalPosition: tally.allocated + 1,
      covariates: input.covariates,
      tally,
    });
    const allocation = await this.record(manager, {
      studyId: input.studyId,
      enrollmentId: input.enrollmentId,
      sequence: decision.arrivalPosition,
      stratumKey: 'all',
      covariates: input.covariates,
      levels: decision.levels,
      slotId: null,
      conditionId: decision.conditionId,
      conditionOrder: null,
    });
    return this.outcomeOf(allocation, null);
  }

  /** Counts per factor level and condition, aggregated in SQL rather than loading every allocation. */
  private async minimizationTally(
    manager: EntityManager,
    studyId: string,
    parameters: Extract<SchemeParameters, { method: 'minimization' }>,
  ): Promise<MinimizationTally> {
    const tally = emptyTallyOf(parameters);
    const [{ n }] = await manager.query(`SELECT count(*) AS n FROM allocation WHERE study_id = $1`, [studyId]);
    tally.allocated = Number(n);
    const rows: Array<{ factor: string; level: string; condition_id: string; n: string }> = await manager.query(
      `SELECT l.key AS factor, l.value AS level, a.condition_id, count(*) AS n
       FROM allocation a CROSS JOIN LATERAL jsonb_each_text(a.levels) l
       WHERE a.study_id = $1 GROUP BY 1, 2, 3`,
      [studyId],
    );
    for (const row of rows) {
      const index = tally.conditionIds.indexOf(row.condition_id);
      const levelCounts = tally.counts[row.factor]?.[row.level];
      if (index >= 0 && levelCounts) levelCounts[index] = Number(row.n);
    }
    return tally;
  }

  private async takeReservedSlot(
    manager: EntityManager,
    input: { studyId: string; enrollmentId: string; covariates: CovariateRecord },
  ): Promise<AllocationOutcome> {
    const slot = await manager.findOne(AllocationSlotEntity, {
      where: { studyId: input.studyId, reservedFor: input.enrollmentId },
      lock: { mode: 'pessimistic_write' },
    });
    if (!slot) {
      throw new RandomizationException(
        'NOT_IN_PAIRED_COHORT',
        'This person is not part of the paired cohort, so matched-pairs assignment cannot place them.',
      );
    }
    await manager.update(AllocationSlotEntity, { id: slot.id }, { takenBy: input.enrollmentId, takenAt: new Date() });
    const [{ nextval }] = await manager.query(`SELECT nextval('allocation_sequence') AS nextval`);
    const allocation = await this.record(manager, {
      studyId: input.studyId,
      enrollmentId: input.enrollmentId,
      sequence: Number(nextval),
      stratumKey: slot.stratumKey,
      covariates: input.covariates,
      levels: {},
      slotId: slot.id,
      conditionId: slot.conditionId,
      conditionOrder: null,
    });
    return this.outcomeOf(allocation, slot.position);
  }

  private async record(
    manager: EntityManager,
    values: Omit<AllocationEntity, 'id' | 'allocatedAt'>,
  ): Promise<AllocationEntity> {
    return manager.save(manager.create(AllocationEntity, values));
  }

  private outcomeOf(allocation: AllocationEntity, slotPosition: number | null): AllocationOutcome {
    return {
      conditionId: allocation.conditionId,
      conditionOrder: allocation.conditionOrder,
      stratumKey: allocation.stratumKey,
      sequence: allocation.sequence,
      slotPosition,
    };
  }

  /**
   * Matched pairs: pairs the whole pretested cohort at once (sorted by pretest, neighbours paired, a fair coin in
   * each pair) and reserves each member's slot, which they take when they sign. The cohort is kept as paired so
   * verification can pair it again from the revealed seed.
   */
  async pairCohort(
    manager: EntityManager,
    actor: AuditActor,
    studyId: string,
    cohort: Array<{ enrollmentId: string; pretest: number }>,
  ): Promise<{ pairs: number; leftoverEnrollmentId: string | null }> {
    await manager.query(`SELECT pg_advisory_xact_lock(hashtextextended($1, 0))`, [`allocation:${studyId}:*`]);
    const scheme = await this.schemeOf(studyId, manager);
    if (!scheme?.sealedParameters || scheme.method !== 'matched-pairs') {
      throw new RandomizationException(
        'PAIRING_NOT_APPLICABLE',
        'Pairing applies to an open study whose scheme is matched pairs.',
      );
    }
    if (scheme.pairedCohort)
      throw new RandomizationException(
        'COHORT_ALREADY_PAIRED',
        'The cohort has already been paired; matched pairs pair one batch.',
      );
    if (cohort.length < 2)
      throw new RandomizationException(
        'COHORT_TOO_SMALL',
        'Pairing needs at least two pretested people on the roster.',
      );
    const parameters = parseParametersOf(scheme.sealedParameters, ['matched-pairs']);
    const seed = await this.sealedSeed(manager, studyId);
    const result = assignMatchedPairs(
      seed,
      parameters,
      cohort.map((c) => ({ participantId: c.enrollmentId, pretest: c.pretest })),
    );
    const slots = [
      ...result.pairs.flatMap((pair) =>
        pair.members.map((member, i) => ({ stratumKey: `pair-${pair.pairIndex}`, position: i + 1, member })),
      ),
      ...(result.leftover ? [{ stratumKey: 'unpaired', position: 1, member: result.leftover }] : []),
    ];
    await manager.insert(
      AllocationSlotEntity,
      slots.map(({ stratumKey, position, member }) => ({
        studyId,
        stratumKey,
        position,
        conditionId: member.conditionId,
        reservedFor: member.participantId,
      })),
    );
    await manager.update(AssignmentSchemeEntity, { studyId }, { pairedCohort: cohort as never });
    await this.audit.record(manager, {
      chain: studyId,
      actor,
      action: 'assignment.cohort-paired',
      subjectType: 'study',
      subjectId: studyId,
      data: { cohort: cohort.length, pairs: result.pairs.length, leftover: result.leftover?.participantId ?? null },
    });
    return { pairs: result.pairs.length, leftoverEnrollmentId: result.leftover?.participantId ?? null };
  }

  /**
   * Re-derives the whole sequence from the revealed seed and compares it, allocation by allocation; then compares
   * each enrollment's condition and order (what the dropout watch and exports read) with its allocation.
   */
  async verify(studyId: string): Promise<AssignmentVerification> {
    const report = await this.verifySequence(studyId);
    const mismatches = await this.enrollmentMismatches(studyId);
    const expectedBy = new Map(report.checks.map((check) => [check.participantId, check.expected]));
    for (const mismatch of mismatches) mismatch.expected = expectedBy.get(mismatch.enrollmentId) ?? null;
    const flagged = new Set(mismatches.map((m) => m.enrollmentId));
    const checks = report.checks.map((check) => ({ ...check, enrollmentMatches: !flagged.has(check.participantId) }));
    return {
      ...report,
      checks,
      allMatch: report.allMatch && mismatches.length === 0,
      enrollmentMismatches: mismatches,
    };
  }

  /**
   * Enrollments whose recorded condition or order is not their allocation's: changed after assignment, or set with
   * no allocation at all. An enrollment whose copy was never written (allocated, not yet marked assigned) is fine.
   * Reads the enrollment's copy of this domain's decision, nothing else of the enrollment.
   */
  private async enrollmentMismatches(studyId: string): Promise<EnrollmentMismatch[]> {
    const rows: Array<{
      id: string;
      e_condition: string | null;
      e_order: string[] | null;
      allocated: boolean;
      a_condition: string | null;
      a_order: string[] | null;
      a_study: string | null;
    }> = await this.dataSource.query(
      `SELECT e.id, e.condition_id AS e_condition, e.condition_order AS e_order, a.id IS NOT NULL AS allocated,
                a.condition_id AS a_condition, a.condition_order AS a_order, a.study_id AS a_study
         FROM enrollment e LEFT JOIN allocation a ON a.enrollment_id = e.id
         WHERE e.study_id = $1 AND (a.id IS NOT NULL OR e.condition_id IS NOT NULL OR e.condition_order IS NOT NULL)
         ORDER BY e.id`,
      [studyId],
    );
    const mismatches: EnrollmentMismatch[] = [];
    for (const row of rows) {
      const enrollment = { conditionId: row.e_condition, order: row.e_order };
      const allocation = row.allocated ? { conditionId: row.a_condition, order: row.a_order } : null;
      const copied = enrollment.conditionId !== null || enrollment.order !== null;
      let reason: EnrollmentMismatch['reason'] | null = null;
      if (!allocation) reason = 'no-allocation';
      else if (row.a_study !== studyId) reason = 'allocation-of-another-study';
      else if (
        copied &&
        (enrollment.conditionId !== allocation.conditionId ||
          JSON.stringify(enrollment.order) !== JSON.stringify(allocation.order))
      )
        reason = 'differs-from-allocation';
      if (reason) mismatches.push({ enrollmentId: row.id, reason, enrollment, allocation, expected: null });
    }
    return mismatches;
  }

  private async verifySequence(
    studyId: string,
  ): Promise<VerificationReport & { commitmentMatches: boolean; seed: string; commitment: string }> {
    const scheme = await this.schemeOf(studyId);
    if (!scheme?.commitment || !scheme.sealedParameters)
      throw new RandomizationException('SEQUENCE_NOT_SEALED', 'This study has no sealed sequence yet.');
    if (!scheme.seedRevealedAt) {
      throw new RandomizationException(
        'SEED_STILL_SEALED',
        'The seed is still sealed: verification is possible after closure or an audited unblinding.',
      );
    }
    const seed = await this.sealedSeed(this.dataSource.manager, studyId);
    const parameters = parseSchemeParameters(scheme.sealedParameters);
    if (parameters.method === 'matched-pairs')
      return { ...(await this.verifyPairs(studyId, seed, parameters, scheme)), seed, commitment: scheme.commitment };
    const allocations = await this.dataSource
      .getRepository(AllocationEntity)
      .find({ where: { studyId }, order: { sequence: 'ASC' } });
    // Slot schemes are verified by the slot each allocation took (claims may be out of arrival order).
    const positions = new Map<string, number>();
    if (usesSlots(parameters)) {
      const rows: Array<{ id: string; position: number }> = await this.dataSource.query(
        `SELECT id, position FROM allocation_slot WHERE study_id = $1 AND taken_by IS NOT NULL`,
        [studyId],
      );
      for (const row of rows) positions.set(row.id, row.position);
    }
    const recorded: RecordedAllocation[] = allocations.map((a) => ({
      participantId: a.enrollmentId,
      covariates: a.covariates,
      conditionId: isWithinDesign(parameters) ? null : a.conditionId,
      order: a.conditionOrder,
      ...(a.slotId && positions.has(a.slotId)
        ? { stratumKey: a.stratumKey, slotPosition: positions.get(a.slotId)! }
        : {}),
    }));
    const report = verifyAllocations(seed, parameters, recorded);
    return {
      ...report,
      commitmentMatches: computeCommitment(seed, parameters) === scheme.commitment,
      seed,
      commitment: scheme.commitment,
    };
  }

  /** Pairs the recorded cohort again and checks every reserved slot (taken or not) holds the derived condition. */
  private async verifyPairs(
    studyId: string,
    seed: string,
    parameters: SchemeParameters,
    scheme: AssignmentSchemeEntity,
  ): Promise<VerificationReport & { commitmentMatches: boolean }> {
    const cohort = scheme.pairedCohort ?? [];
    const slots = await this.dataSource.getRepository(AllocationSlotEntity).find({ where: { studyId } });
    const allocations = await this.dataSource.getRepository(AllocationEntity).find({ where: { studyId } });
    const recordedCondition = new Map<string, string | null>();
    for (const slot of slots) if (slot.reservedFor) recordedCondition.set(slot.reservedFor, slot.conditionId);
    for (const allocation of allocations) recordedCondition.set(allocation.enrollmentId, allocation.conditionId);
    const derived = deriveSequence(
      seed,
      parameters,
      cohort.map((c) => ({
        participantId: c.enrollmentId,
        covariates: { [(parameters as { pretestId: string }).pretestId]: c.pretest },
      })),
    );
    const checks = derived.map((d) => {
      const recorded = recordedCondition.get(d.participantId) ?? null;
      return {
        arrivalPosition: d.arrivalPosition,
        participantId: d.participantId,
        stratumKey: d.pairIndex ? `pair-${d.pairIndex}` : 'unpaired',
        expected: { conditionId: d.conditionId, order: null },
        recorded: { conditionId: recorded, order: null },
        matches: recorded === d.conditionId,
      };
    });
    const matched = checks.filter((c) => c.matches).length;
    return {
      allMatch: matched === checks.length,
      matched,
      mismatched: checks.length - matched,
      checks,
      commitmentMatches: computeCommitment(seed, parameters) === scheme.commitment,
    };
  }

  /** Simulates arrivals under the study's current design and chosen scheme, with a throwaway seed. */
  dryRun(
    method: SchemeMethod,
    settings: SchemeSettings,
    snapshot: StudyDesignSnapshot,
    input: { arrivals: number; seed: string; covariateMix: Record<string, CovariateDistribution> },
  ): DryRunResult {
    const parameters = buildSchemeParameters(method, settings, snapshot);
    return runDryRun({ parameters, arrivals: input.arrivals, seed: input.seed, covariateMix: input.covariateMix });
  }

  private async refuseIfAllocated(manager: EntityManager, studyId: string, what: string): Promise<void> {
    if (await this.hasAllocations(studyId, manager)) {
      throw new RandomizationException('STUDY_DETAIL_FIXED', `${what} cannot change after the first assignment.`);
    }
  }

  /** For the studies domain: refuses a design change once anyone has been assigned. */
  assertDesignUnlocked(manager: EntityManager, studyId: string, what: string): Promise<void> {
    return this.refuseIfAllocated(manager, studyId, what);
  }
}
