import {
  Body,
  Controller,
  Delete,
  Get,
  HttpCode,
  Param,
  Post,
  Put,
  Query,
  Req,
  Res,
  UploadedFile,
  UseInterceptors,
} from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import {
  ApiBody,
  ApiConsumes,
  ApiCreatedResponse,
  ApiOkResponse,
  ApiProduces,
  ApiResponse,
  ApiTags,
} from '@nestjs/swagger';
import type { Request, Response } from 'express';
import { memoryStorage } from 'multer';
import { CurrentUser, PublicWithOptionalSession, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { EnrollmentException } from './enrollment.exception';
import { uuidParam } from '../common/http/uuid-param';
import { ConsentToSignDto } from './dto/enrollment.dto';
import {
  CountDto,
  ImportResultDto,
  InviteDto,
  MarkLostDto,
  MyEnrollmentDto,
  PairCohortResultDto,
  ParticipantRecordDto,
  RosterEntryDto,
  RosterPageDto,
  RosterQueryDto,
  ScreeningResultDto,
  SignatureResultDto,
  SignConsentDto,
  StepCodesDto,
  StepStartDto,
  SubmitScreeningDto,
  UndoCompletionDto,
  WithdrawalResultDto,
  WithdrawDto,
} from './dto/enrollment.dto';
import { CohortService } from './cohort.service';
import { InvitationsService } from './invitations.service';
import { ParticipationService } from './participation.service';
import { ReconsentService } from './reconsent.service';
import { RosterService } from './roster.service';
import { SigningService } from './signing.service';
import { WithdrawalService } from './withdrawal.service';
import { UndoLostDto } from './dto/follow-up.dto';
import { FollowUpService } from './follow-up.service';
import { StepProgressService } from './step-progress.service';
import { StepViewsService } from './step-views.service';
import { StudyMembersOnly } from '../studies';
import { BulkCompletionDto, BulkCompletionResultDto, CompleteStepDto } from '../steps';
import { AppConfig } from '../config/app-config';

const MAX_ROSTER_BYTES = 5 * 1024 * 1024;

function clientOf(request: Request) {
  return { ip: request.ip ?? null, userAgent: request.get('user-agent')?.slice(0, 400) ?? null };
}

function sendPdf(response: Response, pdf: { bytes: Buffer; sha256: string; version: number }, name: string): void {
  response
    .type('application/pdf')
    .setHeader('Content-Disposition', `attachment; filename="${name}"`)
    .setHeader('X-Content-SHA256', pdf.sha256)
    .send(pdf.bytes);
}

/** The participant's own enrollment: join, screening, consent, signature, signed copy, withdrawal. */
@ApiTags('my enrollment')
@Roles('participant')
@Controller('studies/:studyId/enrollments/me')
export class MyEnrollmentController {
  constructor(
    private readonly participation: ParticipationService,
    private readonly signing: SigningService,
    private readonly withdrawal: WithdrawalService,
    private readonly stepProgress: StepProgressService,
  ) {}

  @Post()
  @ApiCreatedResponse({ type: MyEnrollmentDto })
  async join(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Res({ passthrough: true }) response: Response,
  ): Promise<MyEnrollmentDto> {
    const { created, enrollment } = await this.participation.join(user, studyId);
    response.status(created ? 201 : 200);
    return enrollment;
  }

  @Get()
  @ApiOkResponse({ type: MyEnrollmentDto })
  me(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
  ): Promise<MyEnrollmentDto> {
    return this.participation.me(user, studyId);
  }

  @Put('screening')
  @ApiOkResponse({ type: ScreeningResultDto })
  screening(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: SubmitScreeningDto,
  ): Promise<ScreeningResultDto> {
    return this.participation.submitScreening(user, studyId, body.answers);
  }

  @Get('consent')
  @ApiOkResponse({ type: ConsentToSignDto })
  consent(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
  ): Promise<ConsentToSignDto> {
    return this.participation.consentToSign(user, studyId);
  }

  @Post('signature')
  @ApiCreatedResponse({ type: SignatureResultDto })
  async sign(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: SignConsentDto,
    @Req() request: Request,
    @Res({ passthrough: true }) response: Response,
  ): Promise<SignatureResultDto> {
    const { created, result } = await this.signing.sign(user, studyId, body, clientOf(request));
    response.status(created ? 201 : 200);
    return result;
  }

  @Post('steps/:stepId/complete')
  @HttpCode(200)
  @ApiOkResponse({ type: MyEnrollmentDto })
  async completeStep(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
    @Body() body: CompleteStepDto,
  ): Promise<MyEnrollmentDto> {
    await this.stepProgress.completeWithCode(user, studyId, stepId, body.code);
    return this.participation.me(user, studyId);
  }

  @Get('steps/:stepId/start')
  @ApiOkResponse({
    type: StepStartDto,
    description: "The lab's external task for this step, with the reference and a signed return address",
  })
  startStep(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
  ): Promise<StepStartDto> {
    return this.stepProgress.startTask(user, studyId, stepId);
  }

  @Get('consent.pdf')
  @ApiProduces('application/pdf')
  async pdf(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Res() response: Response,
  ): Promise<void> {
    const pdf = await this.participation.myPdf(user, studyId);
    sendPdf(response, pdf, `signed-consent-v${pdf.version}.pdf`);
  }

  @Post('withdraw')
  @HttpCode(200)
  @ApiOkResponse({ type: WithdrawalResultDto })
  withdraw(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: WithdrawDto,
  ): Promise<WithdrawalResultDto> {
    return this.withdrawal.withdrawSelf(user, studyId, body.reason);
  }
}

/** The roster, for the study's staff. */
@ApiTags('roster')
@Controller('studies/:studyId/enrollments')
@StudyMembersOnly()
export class RosterController {
  constructor(
    private readonly roster: RosterService,
    private readonly cohort: CohortService,
    private readonly invitations: InvitationsService,
    private readonly reconsent: ReconsentService,
    private readonly withdrawal: WithdrawalService,
    private readonly stepProgress: StepProgressService,
    private readonly stepViews: StepViewsService,
    private readonly followUp: FollowUpService,
  ) {}

  @Get()
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: RosterPageDto })
  list(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Query() query: RosterQueryDto,
  ): Promise<RosterPageDto> {
    return this.roster.roster(studyId, query);
  }

  @Post('import')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiConsumes('multipart/form-data')
  @ApiBody({
    schema: { type: 'object', properties: { file: { type: 'string', format: 'binary' } }, required: ['file'] },
  })
  @ApiOkResponse({ type: ImportResultDto })
  @UseInterceptors(
    FileInterceptor('file', { storage: memoryStorage(), limits: { fileSize: MAX_ROSTER_BYTES, files: 1 } }),
  )
  import(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @UploadedFile() file: Express.Multer.File | undefined,
  ): Promise<ImportResultDto> {
    if (!file || file.size === 0)
      throw new EnrollmentException('VALIDATION_FAILED', 'Attach the roster as a CSV file.', [
        { field: 'file', message: file ? 'is empty' : 'is required' },
      ]);
    if (file.buffer.includes(0)) {
      throw new EnrollmentException('UNSUPPORTED_MEDIA_TYPE', 'The roster must be a CSV text file.', [
        { field: 'file', message: 'is not a text file' },
      ]);
    }
    return this.cohort.importRoster(user, studyId, file.buffer.toString('utf8'));
  }

  @Post('invite')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ type: CountDto })
  async invite(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: InviteDto,
  ): Promise<CountDto> {
    return { count: await this.invitations.invite(user, studyId, body.enrollmentIds) };
  }

  @Post('pair-cohort')
  @HttpCode(200)
  @Roles('coordinator', 'researcher', 'admin')
  @ApiOkResponse({ type: PairCohortResultDto })
  pairCohort(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
  ): Promise<PairCohortResultDto> {
    return this.cohort.pairCohort(user, studyId);
  }

  @Post('reconsent-reminders')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ type: CountDto })
  async remind(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
  ): Promise<CountDto> {
    return { count: await this.reconsent.sendReconsentReminders(user, studyId) };
  }

  @Get(':enrollmentId')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: ParticipantRecordDto })
  record(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string,
  ): Promise<ParticipantRecordDto> {
    return this.roster.record(studyId, enrollmentId);
  }

  @Post(':enrollmentId/steps/:stepId/complete')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ type: RosterEntryDto })
  async checkOff(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
  ): Promise<RosterEntryDto> {
    await this.stepProgress.completeByStaff(user, studyId, enrollmentId, stepId);
    return (await this.roster.record(studyId, enrollmentId)).enrollment;
  }

  @Delete(':enrollmentId/steps/:stepId/complete')
  @Roles('coordinator', 'admin')
  @ApiOkResponse({
    type: RosterEntryDto,
    description: 'Undoes a completion with a reason, only while its payout has not been approved',
  })
  async undoCompletion(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
    @Body() body: UndoCompletionDto,
  ): Promise<RosterEntryDto> {
    await this.stepProgress.undo(user, studyId, enrollmentId, stepId, body.reason);
    return (await this.roster.record(studyId, enrollmentId)).enrollment;
  }

  @Get(':enrollmentId/step-codes')
  @Roles('coordinator', 'researcher', 'admin')
  @ApiOkResponse({
    type: StepCodesDto,
    description: "This participant's own completion codes, for steps that use them",
  })
  stepCodes(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string,
  ): Promise<StepCodesDto> {
    return this.stepViews.codesOf(studyId, enrollmentId);
  }

  @Post(':enrollmentId/lost')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ type: RosterEntryDto })
  lost(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string,
    @Body() body: MarkLostDto,
  ): Promise<RosterEntryDto> {
    return this.withdrawal.markLost(user, studyId, enrollmentId, body.reason);
  }

  @Post(':enrollmentId/lost/undo')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({
    type: RosterEntryDto,
    description: 'Taking part again: active if they finished a step, else assigned',
  })
  async undoLost(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string,
    @Body() body: UndoLostDto,
  ): Promise<RosterEntryDto> {
    await this.followUp.undoLost(user, studyId, enrollmentId, body.reason);
    return (await this.roster.record(studyId, enrollmentId)).enrollment;
  }

  @Post(':enrollmentId/withdraw')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ type: RosterEntryDto })
  withdraw(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string,
    @Body() body: WithdrawDto,
  ): Promise<RosterEntryDto> {
    return this.withdrawal.withdrawOnBehalf(user, studyId, enrollmentId, body.reason);
  }

  @Get(':enrollmentId/signatures/:signatureId/pdf')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiProduces('application/pdf')
  async signedCopy(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string,
    @Param('signatureId', uuidParam('signatureId')) signatureId: string,
    @Res() response: Response,
  ): Promise<void> {
    const pdf = await this.roster.staffPdf(studyId, enrollmentId, signatureId);
    sendPdf(response, pdf, `signed-consent-${enrollmentId.slice(0, 8)}-v${pdf.version}.pdf`);
  }
}

/** Steps across the roster: marking one step done from a list, and every participant's codes for in-person labs. */
@ApiTags('roster')
@Controller('studies/:studyId')
@StudyMembersOnly()
export class StepCompletionsController {
  constructor(
    private readonly stepProgress: StepProgressService,
    private readonly stepViews: StepViewsService,
  ) {}

  @Post('steps/:stepId/completions')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ type: BulkCompletionResultDto, description: 'One row per line; lines that fail write nothing' })
  completeList(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
    @Body() body: BulkCompletionDto,
  ): Promise<BulkCompletionResultDto> {
    return this.stepProgress.completeList(user, studyId, stepId, body.references);
  }

  @Get('step-codes.csv')
  @Roles('coordinator', 'researcher', 'admin')
  @ApiProduces('text/csv')
  async codesCsv(@Param('studyId', uuidParam('studyId')) studyId: string, @Res() response: Response): Promise<void> {
    const csv = await this.stepViews.codesCsv(studyId);
    response
      .type('text/csv')
      .setHeader('Content-Disposition', 'attachment; filename="participant-codes.csv"')
      .send(csv);
  }
}

/** Where a lab's external task sends participants back: checks the signed link, marks the step done, then to the portal. */
@ApiTags('steps and contact')
@Controller('return')
export class ReturnLinkController {
  constructor(
    private readonly stepProgress: StepProgressService,
    private readonly config: AppConfig,
  ) {}

  @Get(':token')
  @PublicWithOptionalSession()
  @ApiResponse({
    status: 302,
    description: "To the portal's return page, which says whether the step was marked done or why not",
  })
  async returnFromTask(
    @Param('token') token: string,
    @CurrentUser() user: SessionUser | undefined,
    @Req() request: Request,
    @Res() response: Response,
  ): Promise<void> {
    const result = await this.stepProgress.completeFromReturnLink(token.slice(0, 400), user ?? null, clientOf(request));
    const target = new URL('/return', this.config.portalUrl);
    target.searchParams.set('result', result.outcome);
    if (result.studySlug) target.searchParams.set('study', result.studySlug);
    if (result.outcome === 'refused') target.searchParams.set('reason', result.reason);
    else target.searchParams.set('step', result.stepId);
    response.redirect(302, target.toString());
  }
}
