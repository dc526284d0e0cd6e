import {
  Body,
  Controller,
  Get,
  HttpCode,
  Param,
  Patch,
  Post,
  Res,
  UploadedFile,
  UseInterceptors,
} from '@nestjs/common';
import {
  checkCreateConsentDraftRequest,
  checkRefillConsentDraftRequest,
  schemaRef,
  type CreateConsentDraftRequest,
  type RefillConsentDraftRequest,
} from '@evenhand/contract/schemas';
import { FileInterceptor } from '@nestjs/platform-express';
import { ApiBody, ApiConsumes, ApiCreatedResponse, ApiOkResponse, ApiTags } from '@nestjs/swagger';
import type { Response } from 'express';
import { memoryStorage } from 'multer';
import { CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { CheckedBody } from '../common/http/checked-body';
import { uuidParam } from '../common/http/uuid-param';
import { StudyMembersOnly } from '../studies';
import { ConsentService, MAX_APPROVAL_LETTER_BYTES } from './consent.service';
import {
  ConsentCheckDto,
  ConsentTemplateListDto,
  ConsentVersionDto,
  ConsentVersionListDto,
  UpdateConsentVersionDto,
} from './dto/consent.dto';

const EDITORS = ['coordinator', 'researcher', 'admin'] as const;

@ApiTags('consent')
@Controller()
export class ConsentController {
  constructor(private readonly consent: ConsentService) {}

  @Get('consent-templates')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: ConsentTemplateListDto })
  templates(): ConsentTemplateListDto {
    return { items: this.consent.listTemplates() };
  }

  @Get('studies/:studyId/consent-versions')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @StudyMembersOnly()
  @ApiOkResponse({ type: ConsentVersionListDto })
  async list(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<ConsentVersionListDto> {
    return { items: await this.consent.list(studyId) };
  }

  @Post('studies/:studyId/consent-versions')
  @Roles(...EDITORS)
  @StudyMembersOnly()
  @ApiBody({ schema: schemaRef('CreateConsentDraftRequest') })
  @ApiCreatedResponse({ type: ConsentVersionDto })
  create(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body(new CheckedBody(checkCreateConsentDraftRequest)) body: CreateConsentDraftRequest,
  ): Promise<ConsentVersionDto> {
    return this.consent.createDraft(user, studyId, body.templateId, body.values);
  }

  @Get('studies/:studyId/consent-versions/:versionId')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @StudyMembersOnly()
  @ApiOkResponse({ type: ConsentVersionDto })
  async get(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('versionId', uuidParam('versionId')) versionId: string,
  ): Promise<ConsentVersionDto> {
    return this.consent.toDto(await this.consent.get(studyId, versionId));
  }

  @Patch('studies/:studyId/consent-versions/:versionId')
  @Roles(...EDITORS)
  @StudyMembersOnly()
  @ApiOkResponse({ type: ConsentVersionDto })
  update(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('versionId', uuidParam('versionId')) versionId: string,
    @Body() body: UpdateConsentVersionDto,
  ): Promise<ConsentVersionDto> {
    return this.consent.updateDraft(user, studyId, versionId, body);
  }

  @Post('studies/:studyId/consent-versions/:versionId/refill')
  @HttpCode(200)
  @Roles(...EDITORS)
  @StudyMembersOnly()
  @ApiBody({ schema: schemaRef('RefillConsentDraftRequest') })
  @ApiOkResponse({ type: ConsentVersionDto })
  refill(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('versionId', uuidParam('versionId')) versionId: string,
    @Body(new CheckedBody(checkRefillConsentDraftRequest)) body: RefillConsentDraftRequest,
  ): Promise<ConsentVersionDto> {
    return this.consent.refillDraft(user, studyId, versionId, body.values);
  }

  @Post('studies/:studyId/consent-versions/:versionId/check')
  @HttpCode(200)
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @StudyMembersOnly()
  @ApiOkResponse({ type: ConsentCheckDto })
  check(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('versionId', uuidParam('versionId')) versionId: string,
  ): Promise<ConsentCheckDto> {
    return this.consent.check(studyId, versionId);
  }

  @Post('studies/:studyId/consent-versions/:versionId/approval-letter')
  @HttpCode(200)
  @Roles(...EDITORS)
  @StudyMembersOnly()
  @ApiConsumes('multipart/form-data')
  @ApiBody({
    schema: { type: 'object', properties: { letter: { type: 'string', format: 'binary' } }, required: ['letter'] },
  })
  @ApiOkResponse({ type: ConsentVersionDto })
  // One byte over the limit is enough for multer to refuse, so nothing larger is ever held or stored.
  @UseInterceptors(
    FileInterceptor('letter', {
      storage: memoryStorage(),
      limits: { fileSize: MAX_APPROVAL_LETTER_BYTES + 1, files: 1 },
    }),
  )
  upload(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('versionId', uuidParam('versionId')) versionId: string,
    @UploadedFile() file: Express.Multer.File | undefined,
  ): Promise<ConsentVersionDto> {
    return this.consent.uploadApprovalLetter(user, studyId, versionId, file);
  }

  @Get('studies/:studyId/consent-versions/:versionId/approval-letter')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @StudyMembersOnly()
  async letter(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('versionId', uuidParam('versionId')) versionId: string,
    @Res() response: Response,
  ): Promise<void> {
    const letter = await this.consent.approvalLetter(studyId, versionId);
    response
      .type('application/pdf')
      .setHeader('Content-Disposition', `attachment; filename="${letter.name.replace(/[^\w.-]+/g, '_')}"`);
    response.send(letter.bytes);
  }

  @Post('studies/:studyId/consent-versions/:versionId/activate')
  @HttpCode(200)
  @Roles(...EDITORS)
  @StudyMembersOnly()
  @ApiOkResponse({ type: ConsentVersionDto })
  activate(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('versionId', uuidParam('versionId')) versionId: string,
  ): Promise<ConsentVersionDto> {
    return this.consent.activate(user, studyId, versionId);
  }
}
