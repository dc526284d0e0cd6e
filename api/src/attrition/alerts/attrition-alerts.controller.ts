import { Body, Controller, Get, Param, Put } from '@nestjs/common';
import { ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { CurrentUser, Roles } from '../../common/auth/auth.decorators';
import type { SessionUser } from '../../common/auth/session-user';
import { uuidParam } from '../../common/http/uuid-param';
import { StudyMembersOnly } from '../../studies';
import { AttritionAlertsDto, PutAttritionAlertsDto } from '../dto/attrition-alerts.dto';
import { AttritionAlertsService } from './attrition-alerts.service';

@ApiTags('dropout watch')
@Controller('studies/:studyId/attrition/alerts')
@StudyMembersOnly()
export class AttritionAlertsController {
  constructor(private readonly alerts: AttritionAlertsService) {}

  @Get()
  @Roles('researcher', 'coordinator', 'auditor', 'admin')
  @ApiOkResponse({ type: AttritionAlertsDto })
  get(@Param('studyId', uuidParam('studyId')) studyId: string): Promise<AttritionAlertsDto> {
    return this.alerts.get(studyId);
  }

  @Put()
  @Roles('researcher', 'admin')
  @ApiOkResponse({ type: AttritionAlertsDto })
  put(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Body() body: PutAttritionAlertsDto,
  ): Promise<AttritionAlertsDto> {
    return this.alerts.put(user, studyId, body);
  }
}
