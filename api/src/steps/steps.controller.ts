import { Body, Controller, Delete, Get, HttpCode, Param, Patch, Post, Put } from '@nestjs/common';
import { ApiCreatedResponse, ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { uuidParam } from '../common/http/uuid-param';
import { StudyMembersOnly } from '../studies';
import {
  CreateStepDto,
  ReturnLinkSetupDto,
  SetCompletionCodeDto,
  SetPayOverrideDto,
  StepListDto,
  StepSettingsDto,
  UpdateStepDto,
} from './dto/step.dto';
import { StepsService } from './steps.service';

const DESIGNERS = ['coordinator', 'researcher', 'admin'] as const;

@ApiTags('steps')
@Controller('studies/:studyId/steps')
@StudyMembersOnly()
export class StepsController {
  constructor(private readonly steps: StepsService) {}

  @Get()
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: StepListDto })
  list(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<StepListDto> {
    return this.steps.list(studyId);
  }

  @Post()
  @Roles(...DESIGNERS)
  @ApiCreatedResponse({ type: StepListDto })
  create(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: CreateStepDto,
  ): Promise<StepListDto> {
    return this.steps.create(user, studyId, body);
  }

  @Patch(':stepId')
  @Roles(...DESIGNERS)
  @ApiOkResponse({ type: StepListDto })
  update(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
    @Body() body: UpdateStepDto,
  ): Promise<StepListDto> {
    return this.steps.update(user, studyId, stepId, body);
  }

  @Put(':stepId')
  @Roles(...DESIGNERS)
  @ApiOkResponse({
    type: StepListDto,
    description: 'How the step is verified (return link, per-participant code, one shared code, staff) and its window',
  })
  saveSettings(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
    @Body() body: StepSettingsDto,
  ): Promise<StepListDto> {
    return this.steps.saveSettings(user, studyId, stepId, body);
  }

  @Get('return-link')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: ReturnLinkSetupDto })
  returnLink(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<ReturnLinkSetupDto> {
    return this.steps.returnLinkSetup(studyId);
  }

  @Post('return-link/rotate-key')
  @HttpCode(200)
  @Roles(...DESIGNERS)
  @ApiOkResponse({ type: ReturnLinkSetupDto })
  rotateReturnKey(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
  ): Promise<ReturnLinkSetupDto> {
    return this.steps.rotateReturnKey(user, studyId);
  }

  @Put(':stepId/completion-code')
  @Roles(...DESIGNERS)
  @ApiOkResponse({ type: StepListDto })
  setCode(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
    @Body() body: SetCompletionCodeDto,
  ): Promise<StepListDto> {
    return this.steps.setCompletionCode(user, studyId, stepId, body.code);
  }

  @Put(':stepId/pay-overrides/:conditionId')
  @Roles('researcher', 'admin')
  @ApiOkResponse({ type: StepListDto })
  setOverride(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
    @Param('conditionId', uuidParam('conditionId')) conditionId: string,
    @Body() body: SetPayOverrideDto,
  ): Promise<StepListDto> {
    return this.steps.setPayOverride(user, studyId, stepId, conditionId, body);
  }

  @Delete(':stepId/pay-overrides/:conditionId')
  @Roles('researcher', 'admin')
  @ApiOkResponse({ type: StepListDto })
  removeOverride(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('stepId', uuidParam('stepId')) stepId: string,
    @Param('conditionId', uuidParam('conditionId')) conditionId: string,
  ): Promise<StepListDto> {
    return this.steps.removePayOverride(user, studyId, stepId, conditionId);
  }
}
