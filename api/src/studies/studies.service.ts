import { Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager } from 'typeorm';
import { AuditService } from '../audit';
import type { SessionUser } from '../common/auth/session-user';
import { ValidationException } from '../common/errors/domain.exception';
import { StudyException } from './study.exception';
import { RandomizationService } from '../randomization';
import type { StudyDesignSnapshot } from '../randomization';
import { factorLevels } from '../randomization';
import { PRETEST_CUTOFF_EXPLANATION } from '../randomization';
import { queryRows } from '../database/raw-query';
import { UserEntity } from '../users';
import {
  AddMemberDto,
  ConditionDto,
  CreateConditionDto,
  CreateStudyDto,
  MemberListDto,
  StratificationFactorInputDto,
  StratificationFactorListDto,
  StudyDto,
  StudyListDto,
  UpdateConditionDto,
  UpdateStudyDto,
} from './dto/study.dto';
import { ConditionEntity } from './entities/condition.entity';
import { StratificationFactorEntity } from './entities/stratification-factor.entity';
import { StudyMembershipEntity } from './entities/study-membership.entity';
import { StudyEntity, StudyStatus } from './entities/study.entity';
import { checkFactorDefinitions, checkScreeningQuestions } from './stratification-factor-rules';
import { ScreeningQuestionEntity } from './entities/screening-question.entity';
import { ScreeningQuestionDto, ScreeningQuestionInputDto, ScreeningQuestionListDto } from './dto/screening.dto';
import { OpeningChecklistDto } from './dto/opening-checklist.dto';

type Transition = 'open' | 'pause' | 'close';

const ALLOWED_TRANSITIONS: Record<Transition, StudyStatus[]> = {
  open: ['draft', 'paused'],
  pause: ['recruiting'],
  close: ['recruiting', 'paused'],
};
const STATUS_AFTER: Record<Transition, StudyStatus> = { open: 'recruiting', pause: 'paused', close: 'closed' };

/** Neutral codes for conditions, shown instead of names while a study is blinded. */
function conditionCode(position: number): string {
  return (
    String.fromCharCode('A'.charCodeAt(0) + ((position - 1) % 26)) +
    (position > 26 ? String(Math.ceil(position / 26)) : '')
  );
}

/** One thing a study needs before it opens; `check` returns what is missing, or null when met. */
export interface OpeningRequirement {
  key: string;
  label: string;
  /** Position on the checklist. */
  order: number;
  check(manager: EntityManager, studyId: string): Promise<string | null>;
}

import { STUDY_EDIT_RULES, refusedDetailChanges, type StudyDetails } from './study-edit-rules';
@Injectable()
export class StudiesService {
  private openingRequirements: OpeningRequirement[] = [];

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly randomization: RandomizationService,
  ) {
    this.addOpeningRequirement({
      key: 'conditions',
      label: 'At least two conditions',
      order: 1,
      check: async (manager, studyId) => {
        const count = await manager.count(ConditionEntity, { where: { studyId } });
        return count >= 2 ? null : `add at least two conditions (${count} so far)`;
      },
    });
    this.addOpeningRequirement({
      key: 'assignmentScheme',
      label: 'A saved assignment scheme',
      order: 2,
      check: async (manager, studyId) =>
        (await this.randomization.schemeOf(studyId, manager)) ? null : 'choose and save an assignment scheme',
    });
  }

  /** Admins and auditors see every study; other staff only those they are members of; participants those they take part in. */
  async listFor(user: SessionUser, archived = false): Promise<StudyListDto> {
    const builder = this.dataSource.getRepository(StudyEntity).createQueryBuilder('study');
    if (user.role === 'participant') {
      // The enrollments domain owns participation; studies only filters by it.
      builder.where('study.id IN (SELECT study_id FROM enrollment WHERE participant_id = :userId)', {
        userId: user.id,
      });
    } else {
      if (user.role !== 'admin' && user.role !== 'auditor') {
        builder.innerJoin(
          StudyMembershipEntity,
          'membership',
          'membership.study_id = study.id AND membership.user_id = :userId',
          {
            userId: user.id,
          },
        );
      }
      // Staff lists leave archived studies out unless asked for them; a participant's own list keeps every study.
      builder.where(archived ? 'study.archived_at IS NOT NULL' : 'study.archived_at IS NULL');
    }
    const studies = await builder.orderBy('study.created_at', 'DESC').getMany();
    return {
      items: studies.map(({ id, slug, title, status, design, archivedAt }) => ({
        id,
        slug,
        title,
        status,
        design,
        archivedAt: archivedAt?.toISOString() ?? null,
      })),
    };
  }

  async isMember(userId: string, studyId: string): Promise<boolean> {
    return this.dataSource.getRepository(StudyMembershipEntity).exists({ where: { userId, studyId } });
  }

  async findBySlug(slug: string): Promise<StudyEntity | null> {
    return this.dataSource.getRepository(StudyEntity).findOne({ where: { slug } });
  }

  /** Lets another domain add what a study needs before it opens (consent: an active version; steps: at least one). */
  addOpeningRequirement(requirement: OpeningRequirement): void {
    this.openingRequirements = [...this.openingRequirements.filter((r) => r.key !== requirement.key), requirement].sort(
      (a, b) => a.order - b.order,
    );
  }

  /** Everything a study needs before it opens, each met or with what is missing. */
  async openingChecklist(
    studyId: string,
    manager: EntityManager = this.dataSource.manager,
  ): Promise<OpeningChecklistDto> {
    await this.require(studyId, manager);
    const items = [];
    for (const requirement of this.openingRequirements) {
      const missing = await requirement.check(manager, studyId);
      items.push({ key: requirement.key, label: requirement.label, met: missing === null, detail: missing });
    }
    return { ready: items.every((i) => i.met), items };
  }

  async exists(studyId: string): Promise<boolean> {
    return this.dataSource.getRepository(StudyEntity).exists({ where: { id: studyId } });
  }

  async require(studyId: string, manager: EntityManager = this.dataSource.manager, lock = false): Promise<StudyEntity> {
    const study = await manager.findOne(StudyEntity, {
      where: { id: studyId },
      ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}),
    });
    if (!study) throw new StudyException('NOT_FOUND', 'No such study.');
    return study;
  }

  async toDto(study: StudyEntity): Promise<StudyDto> {
    return {
      id: study.id,
      slug: study.slug,
      title: study.title,
      status: study.status,
      design: study.design,
      protocolNumber: study.protocolNumber,
      summary: study.summary,
      estimatedMinutes: study.estimatedMinutes,
      targetSize: study.targetSize,
      budgetMinor: study.budgetMinor,
      currency: study.currency,
      blinded: study.blinded,
      labName: study.labName,
      contactEmail: study.contactEmail,
      ethicsApprovalReference: study.ethicsApprovalReference,
      archivedAt: study.archivedAt?.toISOString() ?? null,
      assignedCount: await this.randomization.countAllocations(study.id),
      editRules: [...STUDY_EDIT_RULES],
      openedAt: study.openedAt?.toISOString() ?? null,
      closedAt: study.closedAt?.toISOString() ?? null,
      createdAt: study.createdAt.toISOString(),
      designLocked: await this.randomization.hasAllocations(study.id),
    };
  }

  async create(actor: SessionUser, input: CreateStudyDto): Promise<StudyDto> {
    const study = await this.dataSource.transaction(async (manager) => {
      if (await manager.exists(StudyEntity, { where: { slug: input.slug } })) {
        throw new StudyException('SLUG_TAKEN', 'Another study already uses this link name.', [
          { field: 'slug', message: 'is already taken' },
        ]);
      }
      const created = await manager.save(
        manager.create(StudyEntity, { ...input, createdBy: actor.id, status: 'draft' }),
      );
      await manager.insert(StudyMembershipEntity, { studyId: created.id, userId: actor.id, role: actor.role });
      await this.audit.record(manager, {
        chain: created.id,
        actor,
        action: 'study.created',
        subjectType: 'study',
        subjectId: created.id,
        data: { slug: created.slug, title: created.title, design: created.design },
      });
      return created;
    });
    return this.toDto(study);
  }

  async update(actor: SessionUser, studyId: string, input: UpdateStudyDto): Promise<StudyDto> {
    const study = await this.dataSource.transaction(async (manager) => {
      const current = await this.require(studyId, manager, true);
      if (current.archivedAt)
        throw new StudyException(
          'STUDY_ARCHIVED',
          'An archived study is kept as it was. Take it out of the archive to look at it; it stays closed.',
        );
      if (current.status === 'closed')
        throw new StudyException('STUDY_SEALED', 'A closed study is sealed and cannot change.');
      const wanted = { ...input, ...(input.ethicsApprovalReference === '' ? { ethicsApprovalReference: null } : {}) };
      const assignedCount = await this.randomization.countAllocations(studyId, manager);
      const refused = refusedDetailChanges(
        { ...current, archived: false },
        wanted as Partial<StudyDetails>,
        assignedCount,
      );
      if (refused.length > 0) {
        throw new StudyException('STUDY_DETAIL_FIXED', refused.map((r) => r.message).join(' '), refused);
      }
      const changes = Object.fromEntries(
        Object.entries(wanted).filter(([k, v]) => v !== undefined && (current as never)[k] !== v),
      );
      if (Object.keys(changes).length === 0) return current;
      Object.assign(current, changes);
      const saved = await manager.save(current);
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'study.updated',
        subjectType: 'study',
        subjectId: studyId,
        data: { changes },
      });
      return saved;
    });
    return this.toDto(study);
  }

  async transition(actor: SessionUser, studyId: string, transition: Transition): Promise<StudyDto> {
    const study = await this.dataSource.transaction(async (manager) => {
      const current = await this.require(studyId, manager, true);
      if (!ALLOWED_TRANSITIONS[transition].includes(current.status)) {
        throw new StudyException(
          'STUDY_TRANSITION_NOT_ALLOWED',
          `A ${current.status} study cannot be ${transition === 'open' ? 'opened' : transition === 'pause' ? 'paused' : 'closed'}.`,
        );
      }
      if (transition === 'open') {
        const checklist = await this.openingChecklist(studyId, manager);
        const missing = checklist.items.filter((item) => !item.met);
        if (missing.length > 0) {
          throw new StudyException(
            'STUDY_NOT_READY_TO_OPEN',
            `The study cannot open yet: ${missing.map((item) => item.detail).join('; ')}.`,
            missing.map((item) => ({ field: item.key, message: item.detail ?? item.label })),
          );
        }
      }
      if (transition === 'open' && current.status === 'draft') {
        const snapshot = await this.designSnapshot(studyId, manager);
        await this.randomization.sealForOpening(manager, actor, studyId, snapshot);
        current.openedAt = new Date();
      }
      if (transition === 'close') {
        current.closedAt = new Date();
        await this.randomization.revealSeed(manager, actor, studyId, { kind: 'closed' });
      }
      const from = current.status;
      current.status = STATUS_AFTER[transition];
      const saved = await manager.save(current);
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: `study.${transition === 'open' ? 'opened' : transition === 'pause' ? 'paused' : 'closed'}`,
        subjectType: 'study',
        subjectId: studyId,
        data: { from, to: saved.status },
      });
      return saved;
    });
    return this.toDto(study);
  }

  /** Takes a closed study out of the default lists (or brings it back); it stays closed and can still be opened. */
  async setArchived(actor: SessionUser, studyId: string, archived: boolean): Promise<StudyDto> {
    const study = await this.dataSource.transaction(async (manager) => {
      const current = await this.require(studyId, manager, true);
      if (archived && current.status !== 'closed') {
        throw new StudyException(
          'STUDY_NOT_CLOSED',
          `Only a closed study can be archived; this one is ${current.status}. Close it first.`,
        );
      }
      if (archived === (current.archivedAt !== null)) return current;
      current.archivedAt = archived ? new Date() : null;
      const saved = await manager.save(current);
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: archived ? 'study.archived' : 'study.unarchived',
        subjectType: 'study',
        subjectId: studyId,
        data: {},
      });
      return saved;
    });
    return this.toDto(study);
  }

  /** What the assignment engine needs to know about the design, read in the caller's transaction. */
  async designSnapshot(
    studyId: string,
    manager: EntityManager = this.dataSource.manager,
  ): Promise<StudyDesignSnapshot> {
    const study = await this.require(studyId, manager);
    const conditions = await manager.find(ConditionEntity, { where: { studyId }, order: { position: 'ASC' } });
    const factors = await manager.find(StratificationFactorEntity, { where: { studyId }, order: { position: 'ASC' } });
    return {
      design: study.design,
      conditions: conditions.map((c) => ({ id: c.id, weight: c.allocationWeight })),
      factors: factors.map((f) => ({
        key: f.key,
        kind: f.kind,
        cutPoints: f.cutPoints,
        categories: f.categories,
        minimizationWeight: f.minimizationWeight,
      })),
    };
  }

  // ── conditions ────────────────────────────────────────────────────────────

  async listConditions(studyId: string): Promise<ConditionDto[]> {
    const study = await this.require(studyId);
    const conditions = await this.dataSource
      .getRepository(ConditionEntity)
      .find({ where: { studyId }, order: { position: 'ASC' } });
    const scheme = await this.randomization.schemeOf(studyId);
    const hideNames = study.blinded && study.status !== 'draft' && !scheme?.unblindedAt;
    return conditions.map((c) => this.conditionDto(c, hideNames));
  }

  /** What a participant may know of the conditions: labels and instructions, never internal names. */
  async listConditionsForParticipant(
    studyId: string,
  ): Promise<Array<{ id: string; participantLabel: string; participantInstructions: string }>> {
    const conditions = await this.dataSource
      .getRepository(ConditionEntity)
      .find({ where: { studyId }, order: { position: 'ASC' } });
    return conditions.map(({ id, participantLabel, participantInstructions }) => ({
      id,
      participantLabel,
      participantInstructions,
    }));
  }

  hasCondition(
    studyId: string,
    conditionId: string,
    manager: EntityManager = this.dataSource.manager,
  ): Promise<boolean> {
    return manager.exists(ConditionEntity, { where: { id: conditionId, studyId } });
  }

  private conditionDto(c: ConditionEntity, hideName: boolean): ConditionDto {
    return {
      id: c.id,
      code: c.code,
      internalName: hideName ? null : c.internalName,
      participantLabel: c.participantLabel,
      participantInstructions: c.participantInstructions,
      allocationWeight: c.allocationWeight,
      position: c.position,
    };
  }

  async createCondition(actor: SessionUser, studyId: string, input: CreateConditionDto): Promise<ConditionDto> {
    return this.changeDesign(actor, studyId, 'Conditions', async (manager) => {
      const [{ max }] = await manager.query(
        `SELECT coalesce(max(position), 0) AS max FROM condition WHERE study_id = $1`,
        [studyId],
      );
      const position = Number(max) + 1;
      await this.refuseDuplicateConditionName(manager, studyId, input.internalName);
      const condition = await manager.save(
        manager.create(ConditionEntity, {
          studyId,
          position,
          code: conditionCode(position),
          internalName: input.internalName,
          participantLabel: input.participantLabel,
          participantInstructions: input.participantInstructions ?? '',
          allocationWeight: input.allocationWeight ?? 1,
        }),
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'condition.created',
        subjectType: 'condition',
        subjectId: condition.id,
        data: {
          code: condition.code,
          internalName: condition.internalName,
          allocationWeight: condition.allocationWeight,
        },
      });
      return this.conditionDto(condition, false);
    });
  }

  async updateCondition(
    actor: SessionUser,
    studyId: string,
    conditionId: string,
    input: UpdateConditionDto,
  ): Promise<ConditionDto> {
    // What participants read can be corrected at any time; what assignment depends on cannot after the first assignment.
    const touchesAssignment = input.allocationWeight !== undefined;
    const apply = async (manager: EntityManager) => {
      const condition = await manager.findOne(ConditionEntity, { where: { id: conditionId, studyId } });
      if (!condition) throw new StudyException('NOT_FOUND', 'No such condition in this study.');
      if (input.internalName && input.internalName.toLowerCase() !== condition.internalName.toLowerCase()) {
        await this.refuseDuplicateConditionName(manager, studyId, input.internalName);
      }
      const changes = Object.fromEntries(Object.entries(input).filter(([, v]) => v !== undefined));
      Object.assign(condition, changes);
      const saved = await manager.save(condition);
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'condition.updated',
        subjectType: 'condition',
        subjectId: conditionId,
        data: { changes },
      });
      return this.conditionDto(saved, false);
    };
    if (touchesAssignment) return this.changeDesign(actor, studyId, 'Allocation weights', apply);
    return this.dataSource.transaction(async (manager) => {
      const study = await this.require(studyId, manager, true);
      if (study.status === 'closed')
        throw new StudyException('STUDY_SEALED', 'A closed study is sealed and cannot change.');
      return apply(manager);
    });
  }

  private async refuseDuplicateConditionName(manager: EntityManager, studyId: string, name: string): Promise<void> {
    const [clash] = await manager.query(
      `SELECT 1 FROM condition WHERE study_id = $1 AND lower(internal_name) = lower($2)`,
      [studyId, name],
    );
    if (clash)
      throw new StudyException('CONDITION_NAME_TAKEN', 'Another condition already has this name.', [
        { field: 'internalName', message: 'is already used in this study' },
      ]);
  }

  // ── stratification factors ────────────────────────────────────────────────

  async listFactors(studyId: string): Promise<StratificationFactorListDto> {
    await this.require(studyId);
    const factors = await this.dataSource
      .getRepository(StratificationFactorEntity)
      .find({ where: { studyId }, order: { position: 'ASC' } });
    return { items: factors.map((f) => this.factorDto(f)), pretestNote: PRETEST_CUTOFF_EXPLANATION };
  }

  private factorDto(f: StratificationFactorEntity) {
    const levels =
      f.kind === 'numeric'
        ? factorLevels({ id: f.key, kind: 'numeric', cutPoints: f.cutPoints ?? [] })
        : factorLevels({ id: f.key, kind: 'categorical', categories: f.categories ?? [] });
    return {
      id: f.id,
      key: f.key,
      label: f.label,
      kind: f.kind,
      cutPoints: f.cutPoints,
      categories: f.categories,
      minimizationWeight: f.minimizationWeight,
      levels,
    };
  }

  async replaceFactors(
    actor: SessionUser,
    studyId: string,
    factors: StratificationFactorInputDto[],
  ): Promise<StratificationFactorListDto> {
    checkFactorDefinitions(factors);
    await this.changeDesign(actor, studyId, 'Stratification factors', async (manager) => {
      await manager.delete(StratificationFactorEntity, { studyId });
      await manager.insert(
        StratificationFactorEntity,
        factors.map((f, i) => ({
          studyId,
          key: f.key,
          label: f.label,
          kind: f.kind,
          cutPoints: f.kind === 'numeric' ? f.cutPoints! : null,
          categories: f.kind === 'categorical' ? f.categories! : null,
          minimizationWeight: f.minimizationWeight ?? 1,
          position: i + 1,
        })),
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'stratification.replaced',
        subjectType: 'study',
        subjectId: studyId,
        data: {
          factors: factors.map((f) => ({
            key: f.key,
            kind: f.kind,
            cutPoints: f.cutPoints ?? null,
            categories: f.categories ?? null,
          })),
        },
      });
    });
    return this.listFactors(studyId);
  }

  /**
   * Runs a change to what assignment depends on: refused in a closed study or after the first assignment;
   * in an open study with nobody assigned yet, the sequence is sealed again under a new seed and commitment.
   */
  private async changeDesign<T>(
    actor: SessionUser,
    studyId: string,
    what: string,
    change: (manager: EntityManager) => Promise<T>,
  ): Promise<T> {
    return this.dataSource.transaction(async (manager) => {
      const study = await this.require(studyId, manager, true);
      if (study.status === 'closed')
        throw new StudyException('STUDY_SEALED', 'A closed study is sealed and cannot change.');
      await this.randomization.assertDesignUnlocked(manager, studyId, what);
      const result = await change(manager);
      if (study.status !== 'draft')
        await this.randomization.recommitAfterDesignChange(
          manager,
          actor,
          studyId,
          await this.designSnapshot(studyId, manager),
        );
      return result;
    });
  }

  // ── screening ─────────────────────────────────────────────────────────────

  async screeningDefinition(studyId: string, manager: EntityManager = this.dataSource.manager) {
    const eligibility = await manager.find(ScreeningQuestionEntity, { where: { studyId }, order: { position: 'ASC' } });
    const factors = await manager.find(StratificationFactorEntity, { where: { studyId }, order: { position: 'ASC' } });
    return {
      eligibility,
      stratification: factors.map((f) => ({ key: f.key, label: f.label, kind: f.kind, categories: f.categories })),
    };
  }

  /** The questions in the order a participant answers them: eligibility first, then the stratification answers. */
  async screeningQuestions(
    studyId: string,
    manager: EntityManager = this.dataSource.manager,
    withRules = false,
  ): Promise<ScreeningQuestionDto[]> {
    const { eligibility, stratification } = await this.screeningDefinition(studyId, manager);
    return [
      ...eligibility.map((q) => ({
        key: q.key,
        label: q.label,
        kind: q.kind,
        ...(q.options ? { options: q.options } : {}),
        ...(q.minValue !== null ? { min: q.minValue } : {}),
        ...(q.maxValue !== null ? { max: q.maxValue } : {}),
        ...(q.help ? { help: q.help } : {}),
        purpose: 'eligibility' as const,
        ...(withRules
          ? {
              ...(q.criterion ? { criterion: q.criterion } : {}),
              ...(q.eligibleValues ? { eligibleValues: q.eligibleValues } : {}),
              ...(q.eligibleMin !== null ? { eligibleMin: q.eligibleMin } : {}),
              ...(q.eligibleMax !== null ? { eligibleMax: q.eligibleMax } : {}),
            }
          : {}),
      })),
      ...stratification.map((f) => ({
        key: f.key,
        label: f.label,
        kind: f.kind === 'numeric' ? ('number' as const) : ('choice' as const),
        ...(f.categories ? { options: f.categories } : {}),
        purpose: 'stratification' as const,
      })),
    ];
  }

  async replaceScreeningQuestions(
    actor: SessionUser,
    studyId: string,
    questions: ScreeningQuestionInputDto[],
  ): Promise<ScreeningQuestionListDto> {
    checkScreeningQuestions(questions);
    await this.dataSource.transaction(async (manager) => {
      const study = await this.require(studyId, manager, true);
      if (study.status === 'closed')
        throw new StudyException('STUDY_SEALED', 'A closed study is sealed and cannot change.');
      const factorKeys = (await manager.find(StratificationFactorEntity, { where: { studyId } })).map((f) => f.key);
      const clash = questions.find((q) => factorKeys.includes(q.key));
      if (clash)
        throw new ValidationException([
          { field: 'questions', message: `"${clash.key}" is already a stratification factor of this study` },
        ]);
      await manager.delete(ScreeningQuestionEntity, { studyId });
      await manager.insert(
        ScreeningQuestionEntity,
        questions.map((q, i) => ({
          studyId,
          key: q.key,
          label: q.label,
          kind: q.kind,
          options: q.options ?? null,
          minValue: q.minValue ?? null,
          maxValue: q.maxValue ?? null,
          help: q.help ?? '',
          criterion: q.criterion ?? null,
          eligibleValues: q.eligibleValues ?? null,
          eligibleMin: q.eligibleMin ?? null,
          eligibleMax: q.eligibleMax ?? null,
          position: i + 1,
        })),
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'screening.replaced',
        subjectType: 'study',
        subjectId: studyId,
        data: { keys: questions.map((q) => q.key) },
      });
    });
    return { items: await this.screeningQuestions(studyId, this.dataSource.manager, true) };
  }

  // ── members ───────────────────────────────────────────────────────────────

  async listMembers(studyId: string): Promise<MemberListDto> {
    await this.require(studyId);
    const rows: Array<{ user_id: string; email: string; name: string; role: string }> = await this.dataSource.query(
      `SELECT m.user_id, u.email, u.name, m.role FROM study_membership m JOIN user_account u ON u.id = m.user_id
       WHERE m.study_id = $1 ORDER BY u.name, u.email`,
      [studyId],
    );
    return { items: rows.map((r) => ({ userId: r.user_id, email: r.email, name: r.name, role: r.role as never })) };
  }

  async addMember(actor: SessionUser, studyId: string, input: AddMemberDto): Promise<MemberListDto> {
    await this.dataSource.transaction(async (manager) => {
      await this.require(studyId, manager);
      const user = await manager.findOne(UserEntity, { where: { email: input.email } });
      if (!user || user.role === 'participant' || !user.active) {
        throw new StudyException('NOT_FOUND', 'No active staff account has this e-mail.', [
          { field: 'email', message: 'is not an active staff account' },
        ]);
      }
      // A membership grants what the person's staff role allows, so the two must agree (admins may hold any).
      if (user.role !== 'admin' && user.role !== input.role) {
        throw new StudyException(
          'VALIDATION_FAILED',
          `${user.email} is a ${user.role}; add them to the study as a ${user.role}.`,
          [{ field: 'role', message: `must be ${user.role}, the person's staff role` }],
        );
      }
      await manager.query(
        `INSERT INTO study_membership (study_id, user_id, role) VALUES ($1, $2, $3)
         ON CONFLICT (study_id, user_id) DO UPDATE SET role = EXCLUDED.role`,
        [studyId, user.id, input.role],
      );
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'study.member-added',
        subjectType: 'user',
        subjectId: user.id,
        data: { email: user.email, role: input.role },
      });
    });
    return this.listMembers(studyId);
  }

  async removeMember(actor: SessionUser, studyId: string, userId: string): Promise<MemberListDto> {
    await this.dataSource.transaction(async (manager) => {
      await this.require(studyId, manager, true);
      const [removed] = await queryRows<{ role: string }>(
        manager,
        `DELETE FROM study_membership WHERE study_id = $1 AND user_id = $2 RETURNING role`,
        [studyId, userId],
      );
      if (!removed)
        throw new StudyException('NOT_FOUND', 'This person is not a member of the study.', [
          { field: 'userId', message: 'is not a member' },
        ]);
      await this.audit.record(manager, {
        chain: studyId,
        actor,
        action: 'study.member-removed',
        subjectType: 'user',
        subjectId: userId,
        data: { role: removed.role },
      });
    });
    return this.listMembers(studyId);
  }

  /** The studies one staff member works on, for their page in the staff list. */
  async membershipsOf(userId: string): Promise<Array<{ studyId: string; title: string; slug: string; role: string }>> {
    const rows: Array<{ study_id: string; title: string; slug: string; role: string }> = await this.dataSource.query(
      `SELECT m.study_id, s.title, s.slug, m.role FROM study_membership m JOIN study s ON s.id = m.study_id WHERE m.user_id = $1 ORDER BY s.title`,
      [userId],
    );
    return rows.map((r) => ({ studyId: r.study_id, title: r.title, slug: r.slug, role: r.role }));
  }
}
