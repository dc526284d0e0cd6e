import { Body, Controller, Get, HttpCode, Param, Post, Put } from '@nestjs/common';
import {
  checkAssignmentSchemeRequest,
  checkDryRunRequest,
  schemaRef,
  type AssignmentSchemeRequest,
  type DryRunRequest,
  type DryRunResult,
  type DryRunStartingMix,
} from '@evenhand/contract/schemas';
import { ApiBody, ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import { CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { RandomizationException } from './randomization.exception';
import { CheckedBody } from '../common/http/checked-body';
import { uuidParam } from '../common/http/uuid-param';
import { ScreenedCovariatesReadModel } from '../reporting';
import { StudiesService } from '../studies';
import { StudyMembersOnly } from '../studies';
import { AssignmentDto, UnblindDto, VerificationDto } from './dto/assignment.dto';
import { RandomizationService } from './randomization.service';
import { parseSchemeParameters, SchemeMethod } from './scheme-parameters';
import { generateSeed } from './seeded-stream';
import { startingCovariateMix } from './starting-mix';
import { PRETEST_CUTOFF_EXPLANATION } from './strata';
import type { SchemeSettings } from './study-design-snapshot';

@ApiTags('assignment')
@Controller('studies/:studyId')
@StudyMembersOnly()
export class AssignmentController {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly randomization: RandomizationService,
    private readonly studies: StudiesService,
    private readonly screenedCovariates: ScreenedCovariatesReadModel,
  ) {}

  @Put('assignment-scheme')
  @Roles('coordinator', 'researcher', 'admin')
  @ApiBody({ schema: schemaRef('AssignmentSchemeRequest') })
  @ApiOkResponse({ type: AssignmentDto })
  async putScheme(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body(new CheckedBody(checkAssignmentSchemeRequest)) body: AssignmentSchemeRequest,
  ): Promise<AssignmentDto> {
    const { method, ...settings } = body;
    await this.dataSource.transaction(async (manager) => {
      const study = await this.studies.require(studyId, manager, true);
      if (study.status === 'closed')
        throw new RandomizationException('STUDY_SEALED', 'A closed study is sealed and cannot change.');
      const snapshot = await this.studies.designSnapshot(studyId, manager);
      await this.randomization.saveScheme(manager, user, studyId, method, settings, snapshot, study.status !== 'draft');
    });
    return this.get(studyId);
  }

  @Get('assignment')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: AssignmentDto })
  async get(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<AssignmentDto> {
    await this.studies.require(studyId);
    const overview = await this.randomization.overview(studyId);
    const scheme = await this.randomization.schemeOf(studyId);
    return {
      ...overview,
      settings: overview.settings,
      sealedParameters: scheme?.sealedParameters ? parseSchemeParameters(scheme.sealedParameters) : null,
      committedAt: overview.committedAt?.toISOString() ?? null,
      seedRevealedAt: overview.seedRevealedAt?.toISOString() ?? null,
      unblindedAt: overview.unblindedAt?.toISOString() ?? null,
      balance: overview.balance.map((s) => ({
        stratumKey: s.stratumKey,
        total: s.total,
        counts: Object.entries(s.counts).map(([armId, count]) => ({ armId, count })),
      })),
      pretestNote: PRETEST_CUTOFF_EXPLANATION,
    };
  }

  @Get('assignment/dry-run/starting-mix')
  @Roles('coordinator', 'researcher', 'admin')
  @ApiOkResponse({ schema: schemaRef('DryRunStartingMix') })
  async startingMix(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<DryRunStartingMix> {
    const snapshot = await this.studies.designSnapshot(studyId);
    return startingCovariateMix(snapshot.factors, await this.screenedCovariates.of(studyId));
  }

  @Post('assignment/dry-run')
  @HttpCode(200)
  @Roles('coordinator', 'researcher', 'admin')
  @ApiBody({ schema: schemaRef('DryRunRequest') })
  @ApiOkResponse({ schema: schemaRef('DryRunResult') })
  async dryRun(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body(new CheckedBody(checkDryRunRequest)) body: DryRunRequest,
  ): Promise<DryRunResult> {
    const snapshot = await this.studies.designSnapshot(studyId);
    const saved = await this.randomization.schemeOf(studyId);
    const method = (body.method ?? saved?.method) as SchemeMethod | undefined;
    if (!method)
      throw new RandomizationException('VALIDATION_FAILED', 'Choose a scheme to simulate.', [
        { field: 'method', message: 'is required when no scheme is saved' },
      ]);
    const settings = (body.method ? (body.settings ?? {}) : (saved?.settings ?? {})) as SchemeSettings;
    // A throwaway seed, returned so the same simulation can be run again; never the study's sealed seed.
    const seed = body.seed?.toLowerCase() ?? generateSeed();
    // No mix given: start from the people screened so far, or an even mix (as the starting-mix route shows).
    const covariateMix =
      body.covariateMix ?? startingCovariateMix(snapshot.factors, await this.screenedCovariates.of(studyId)).mix;
    const result = this.randomization.dryRun(method, settings, snapshot, {
      arrivals: body.arrivals,
      seed,
      covariateMix,
    });
    return { ...result, seed };
  }

  @Post('unblind')
  @HttpCode(200)
  @Roles('researcher', 'admin')
  @ApiOkResponse({ type: AssignmentDto })
  async unblind(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: UnblindDto,
  ): Promise<AssignmentDto> {
    await this.dataSource.transaction(async (manager) => {
      await this.studies.require(studyId, manager, true);
      const scheme = await this.randomization.schemeOf(studyId, manager);
      if (!scheme?.commitment)
        throw new RandomizationException(
          'SEQUENCE_NOT_SEALED',
          'There is nothing to unblind: the study has not opened.',
        );
      await this.randomization.revealSeed(manager, user, studyId, { kind: 'unblinded', text: body.reason });
    });
    return this.get(studyId);
  }

  @Get('assignment/verify')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: VerificationDto })
  async verify(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<VerificationDto> {
    await this.studies.require(studyId);
    const report = await this.randomization.verify(studyId);
    return {
      ...report,
      checks: report.checks.map(({ participantId, ...check }) => ({
        ...check,
        enrollmentId: participantId,
        expected: check.expected,
        recorded: check.recorded,
      })),
    };
  }
}
