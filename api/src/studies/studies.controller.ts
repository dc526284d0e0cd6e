import { Body, Controller, Delete, Get, HttpCode, Param, Patch, Post, Put, Query } from '@nestjs/common';
import { ApiCreatedResponse, ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { uuidParam } from '../common/http/uuid-param';
import {
  AddMemberDto,
  ConditionDto,
  ConditionListDto,
  CreateConditionDto,
  CreateStudyDto,
  MemberListDto,
  ReplaceFactorsDto,
  StratificationFactorListDto,
  StudyDto,
  StudyListDto,
  UpdateConditionDto,
  UpdateStudyDto,
  ListStudiesQueryDto,
} from './dto/study.dto';
import { ReplaceScreeningQuestionsDto, ScreeningQuestionListDto } from './dto/screening.dto';
import { OpeningChecklistDto } from './dto/opening-checklist.dto';
import { StaffStudyListDto } from './dto/staff-study.dto';
import { StudiesService } from './studies.service';
import { StudyMembersOnly } from './study-access.guard';

const DESIGNERS = ['coordinator', 'researcher', 'admin'] as const;

@ApiTags('studies')
@Controller('studies')
export class StudiesController {
  constructor(private readonly studies: StudiesService) {}

  @Get()
  @ApiOkResponse({
    type: StudyListDto,
    description: 'Staff lists leave archived studies out; ?archived=true lists only those',
  })
  list(@CurrentUser() user: SessionUser, @Query() query: ListStudiesQueryDto): Promise<StudyListDto> {
    return this.studies.listFor(user, query.archived === 'true');
  }

  @Post()
  @Roles(...DESIGNERS)
  @ApiCreatedResponse({ type: StudyDto })
  create(@CurrentUser() user: SessionUser, @Body() body: CreateStudyDto): Promise<StudyDto> {
    return this.studies.create(user, body);
  }

  @Get(':studyId')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @StudyMembersOnly()
  @ApiOkResponse({ type: StudyDto })
  async get(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<StudyDto> {
    return this.studies.toDto(await this.studies.require(studyId));
  }

  @Patch(':studyId')
  @Roles(...DESIGNERS)
  @StudyMembersOnly()
  @ApiOkResponse({ type: StudyDto })
  update(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: UpdateStudyDto,
  ): Promise<StudyDto> {
    return this.studies.update(user, studyId, body);
  }

  @Get(':studyId/opening-checklist')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @StudyMembersOnly()
  @ApiOkResponse({ type: OpeningChecklistDto })
  openingChecklist(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<OpeningChecklistDto> {
    return this.studies.openingChecklist(studyId);
  }

  @Post(':studyId/open')
  @HttpCode(200)
  @Roles(...DESIGNERS)
  @StudyMembersOnly()
  @ApiOkResponse({ type: StudyDto })
  open(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string): Promise<StudyDto> {
    return this.studies.transition(user, studyId, 'open');
  }

  @Post(':studyId/archive')
  @HttpCode(200)
  @Roles(...DESIGNERS)
  @StudyMembersOnly()
  @ApiOkResponse({
    type: StudyDto,
    description: 'Closed studies only; archived studies leave the default lists and can still be opened',
  })
  archive(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
  ): Promise<StudyDto> {
    return this.studies.setArchived(user, studyId, true);
  }

  @Post(':studyId/unarchive')
  @HttpCode(200)
  @Roles(...DESIGNERS)
  @StudyMembersOnly()
  @ApiOkResponse({ type: StudyDto })
  unarchive(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
  ): Promise<StudyDto> {
    return this.studies.setArchived(user, studyId, false);
  }

  @Post(':studyId/pause')
  @HttpCode(200)
  @Roles(...DESIGNERS)
  @StudyMembersOnly()
  @ApiOkResponse({ type: StudyDto })
  pause(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string): Promise<StudyDto> {
    return this.studies.transition(user, studyId, 'pause');
  }

  @Post(':studyId/close')
  @HttpCode(200)
  @Roles(...DESIGNERS)
  @StudyMembersOnly()
  @ApiOkResponse({ type: StudyDto })
  close(@CurrentUser() user: SessionUser, @Param('studyId', uuidParam('studyId')) studyId: string): Promise<StudyDto> {
    return this.studies.transition(user, studyId, 'close');
  }

  @Get(':studyId/conditions')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @StudyMembersOnly()
  @ApiOkResponse({ type: ConditionListDto })
  async conditions(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<ConditionListDto> {
    return { items: await this.studies.listConditions(studyId) };
  }

  @Post(':studyId/conditions')
  @Roles(...DESIGNERS)
  @StudyMembersOnly()
  @ApiCreatedResponse({ type: ConditionDto })
  addCondition(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: CreateConditionDto,
  ): Promise<ConditionDto> {
    return this.studies.createCondition(user, studyId, body);
  }

  @Patch(':studyId/conditions/:conditionId')
  @Roles(...DESIGNERS)
  @StudyMembersOnly()
  @ApiOkResponse({ type: ConditionDto })
  updateCondition(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('conditionId', uuidParam('conditionId')) conditionId: string,
    @Body() body: UpdateConditionDto,
  ): Promise<ConditionDto> {
    return this.studies.updateCondition(user, studyId, conditionId, body);
  }

  @Get(':studyId/stratification-factors')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @StudyMembersOnly()
  @ApiOkResponse({ type: StratificationFactorListDto })
  factors(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<StratificationFactorListDto> {
    return this.studies.listFactors(studyId);
  }

  @Put(':studyId/stratification-factors')
  @Roles(...DESIGNERS)
  @StudyMembersOnly()
  @ApiOkResponse({ type: StratificationFactorListDto })
  replaceFactors(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: ReplaceFactorsDto,
  ): Promise<StratificationFactorListDto> {
    return this.studies.replaceFactors(user, studyId, body.factors);
  }

  @Get(':studyId/screening-questions')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @StudyMembersOnly()
  @ApiOkResponse({ type: ScreeningQuestionListDto })
  async screeningQuestions(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<ScreeningQuestionListDto> {
    await this.studies.require(studyId);
    return { items: await this.studies.screeningQuestions(studyId, undefined, true) };
  }

  @Put(':studyId/screening-questions')
  @Roles(...DESIGNERS)
  @StudyMembersOnly()
  @ApiOkResponse({ type: ScreeningQuestionListDto })
  replaceScreeningQuestions(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: ReplaceScreeningQuestionsDto,
  ): Promise<ScreeningQuestionListDto> {
    return this.studies.replaceScreeningQuestions(user, studyId, body.questions);
  }

  @Get(':studyId/members')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @StudyMembersOnly()
  @ApiOkResponse({ type: MemberListDto })
  members(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<MemberListDto> {
    return this.studies.listMembers(studyId);
  }

  @Post(':studyId/members')
  @Roles('admin')
  @StudyMembersOnly()
  @ApiCreatedResponse({
    type: MemberListDto,
    description: "Admins only; the membership role must match the person's staff role",
  })
  addMember(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: AddMemberDto,
  ): Promise<MemberListDto> {
    return this.studies.addMember(user, studyId, body);
  }

  @Delete(':studyId/members/:userId')
  @Roles('admin')
  @StudyMembersOnly()
  @ApiOkResponse({ type: MemberListDto, description: 'Admins only' })
  removeMember(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('userId', uuidParam('userId')) userId: string,
  ): Promise<MemberListDto> {
    return this.studies.removeMember(user, studyId, userId);
  }
}

/** The studies one staff member works on, for their page in the staff list (admins only). */
@ApiTags('staff')
@Controller('staff/:userId/studies')
export class StaffStudiesController {
  constructor(private readonly studies: StudiesService) {}

  @Get()
  @Roles('admin')
  @ApiOkResponse({ type: StaffStudyListDto })
  async list(@Param('userId', uuidParam('userId')) userId: string): Promise<StaffStudyListDto> {
    return { items: await this.studies.membershipsOf(userId) };
  }
}
