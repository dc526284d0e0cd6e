import { Body, Controller, Get, HttpCode, Param, Post, Put, Query, Req, Res, UploadedFile, UseInterceptors } from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import { ApiBody, ApiConsumes, ApiCreatedResponse, ApiOkResponse, ApiProduces, ApiTags } from '@nestjs/swagger';
import type { Request, Response } from 'express';
import { memoryStorage } from 'multer';
import { CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { DomainException } from '../common/errors/domain.exception';
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
  SubmitScreeningDto,
  WithdrawalResultDto,
  WithdrawDto,
} from './dto/enrollment.dto';
import { EnrollmentsService } from './enrollments.service';
import { StudyMembersOnly } from '../studies/study-access.guard';
import { CompleteStepDto } from '../steps/dto/step.dto';

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
  constructor(private readonly enrollments: EnrollmentsService) {}

  @Post()
  @ApiCreatedResponse({ type: MyEnrollmentDto })
  async join(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string, @Res({ passthrough: true }) response: Response): Promise<MyEnrollmentDto> {
    const { created, enrollment } = await this.enrollments.join(user, studyId);
    response.status(created ? 201 : 200);
    return enrollment;
  }

  @Get()
  @ApiOkResponse({ type: MyEnrollmentDto })
  me(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string): Promise<MyEnrollmentDto> {
    return this.enrollments.me(user, studyId);
  }

  @Put('screening')
  @ApiOkResponse({ type: ScreeningResultDto })
  screening(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string, @Body() body: SubmitScreeningDto): Promise<ScreeningResultDto> {
    return this.enrollments.submitScreening(user, studyId, body.answers);
  }

  @Get('consent')
  @ApiOkResponse({ type: ConsentToSignDto })
  consent(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string): Promise<ConsentToSignDto> {
    return this.enrollments.consentToSign(user, studyId);
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
    const { created, result } = await this.enrollments.sign(user, studyId, body, clientOf(request));
    response.status(created ? 201 : 200);
    return result;
  }

  @Post('steps/:stepId/complete')
  @HttpCode(200)
  @ApiOkResponse({ type: MyEnrollmentDto })
  completeStep(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
    @Body() body: CompleteStepDto,
  ): Promise<MyEnrollmentDto> {
    return this.enrollments.completeStepWithCode(user, studyId, stepId, body.code);
  }

  @Get('consent.pdf')
  @ApiProduces('application/pdf')
  async pdf(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string, @Res() response: Response): Promise<void> {
    const pdf = await this.enrollments.myPdf(user, studyId);
    sendPdf(response, pdf, `signed-consent-v${pdf.version}.pdf`);
  }

  @Post('withdraw')
  @HttpCode(200)
  @ApiOkResponse({ type: WithdrawalResultDto })
  withdraw(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string, @Body() body: WithdrawDto): Promise<WithdrawalResultDto> {
    return this.enrollments.withdrawSelf(user, studyId, body.reason);
  }
}

/** The roster, for the study's staff. */
@ApiTags('roster')
@Controller('studies/:studyId/enrollments')
@StudyMembersOnly()
export class RosterController {
  constructor(private readonly enrollments: EnrollmentsService) {}

  @Get()
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: RosterPageDto })
  list(@Param('studyId', uuidParam('studyId')) studyId: string, @Query() query: RosterQueryDto): Promise<RosterPageDto> {
    return this.enrollments.roster(studyId, query);
  }

  @Post('import')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiConsumes('multipart/form-data')
  @ApiBody({ schema: { type: 'object', properties: { file: { type: 'string', format: 'binary' } }, required: ['file'] } })
  @ApiOkResponse({ type: ImportResultDto })
  @UseInterceptors(FileInterceptor('file', { storage: memoryStorage(), limits: { fileSize: MAX_ROSTER_BYTES, files: 1 } }))
  import(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string, @UploadedFile() file: Express.Multer.File | undefined): Promise<ImportResultDto> {
    if (!file || file.size === 0) throw new DomainException('VALIDATION_FAILED', 'Attach the roster as a CSV file.', [{ field: 'file', message: file ? 'is empty' : 'is required' }]);
    if (file.buffer.includes(0)) {
      throw new DomainException('UNSUPPORTED_MEDIA_TYPE', 'The roster must be a CSV text file.', [{ field: 'file', message: 'is not a text file' }]);
    }
    return this.enrollments.importRoster(user, studyId, file.buffer.toString('utf8'));
  }

  @Post('invite')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ type: CountDto })
  async invite(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string, @Body() body: InviteDto): Promise<CountDto> {
    return { count: await this.enrollments.invite(user, studyId, body.enrollmentIds) };
  }

  @Post('pair-cohort')
  @HttpCode(200)
  @Roles('coordinator', 'researcher', 'admin')
  @ApiOkResponse({ type: PairCohortResultDto })
  pairCohort(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string): Promise<PairCohortResultDto> {
    return this.enrollments.pairCohort(user, studyId);
  }

  @Post('reconsent-reminders')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ type: CountDto })
  async remind(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string): Promise<CountDto> {
    return { count: await this.enrollments.sendReconsentReminders(user, studyId) };
  }

  @Get(':enrollmentId')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: ParticipantRecordDto })
  record(@Param('studyId', uuidParam('studyId')) studyId: string, @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string): Promise<ParticipantRecordDto> {
    return this.enrollments.record(studyId, enrollmentId);
  }

  @Post(':enrollmentId/steps/:stepId/complete')
  @HttpCode(200)
  @Roles('coordinator', 'admin')
  @ApiOkResponse({ type: RosterEntryDto })
  checkOff(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
  ): Promise<RosterEntryDto> {
    return this.enrollments.completeStepForParticipant(user, studyId, enrollmentId, stepId);
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
    return this.enrollments.markLost(user, studyId, enrollmentId, body.reason);
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
    return this.enrollments.withdrawOnBehalf(user, studyId, enrollmentId, body.reason);
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
    const pdf = await this.enrollments.staffPdf(studyId, enrollmentId, signatureId);
    sendPdf(response, pdf, `signed-consent-${enrollmentId.slice(0, 8)}-v${pdf.version}.pdf`);
  }
}
