import { Body, Controller, Get, Param, Post, Put } from '@nestjs/common';
import { ApiCreatedResponse, ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { uuidParam } from '../common/http/uuid-param';
import { StudyMembersOnly } from '../studies';
import { ContactsService } from './contacts.service';
import { ContactLogDto, ReminderPlanDto, SaveReminderPlanDto, SendStaffMessageDto } from './dto/reminders.dto';
import { ReminderPlanService } from './reminder-plan.service';

@ApiTags('steps and contact')
@Controller('studies/:studyId')
@StudyMembersOnly()
export class RemindersController {
  constructor(
    private readonly plans: ReminderPlanService,
    private readonly contacts: ContactsService,
  ) {}

  @Get('reminder-plan')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: ReminderPlanDto })
  plan(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<ReminderPlanDto> {
    return this.plans.get(studyId);
  }

  @Put('reminder-plan')
  @Roles('coordinator', 'researcher', 'admin')
  @ApiOkResponse({
    type: ReminderPlanDto,
    description: 'One plan for the whole study: the same reminders for every condition',
  })
  savePlan(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: SaveReminderPlanDto,
  ): Promise<ReminderPlanDto> {
    return this.plans.save(user, studyId, body);
  }

  @Get('enrollments/:enrollmentId/contacts')
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: ContactLogDto })
  log(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string,
  ): Promise<ContactLogDto> {
    return this.contacts.logOf(studyId, enrollmentId);
  }

  @Post('enrollments/:enrollmentId/contacts')
  @Roles('coordinator', 'admin')
  @ApiCreatedResponse({
    type: ContactLogDto,
    description: 'Sends a message to one participant and logs it as a contact',
  })
  message(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Param('enrollmentId', uuidParam('enrollmentId')) enrollmentId: string,
    @Body() body: SendStaffMessageDto,
  ): Promise<ContactLogDto> {
    return this.contacts.sendStaffMessage(user, studyId, enrollmentId, body);
  }
}
