import { Controller, Get, Param, Query, Res } from '@nestjs/common';
import { ApiOkResponse, ApiProduces, ApiTags } from '@nestjs/swagger';
import type { Response } from 'express';
import { CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { uuidParam } from '../common/http/uuid-param';
import { StudyMembersOnly } from '../studies';
import { AttritionService } from './attrition.service';
import { AttritionQueryDto, AttritionReportDto } from './dto/attrition-report.dto';

@ApiTags('dropout watch')
@Controller('studies/:studyId')
@StudyMembersOnly()
export class AttritionController {
  constructor(private readonly attrition: AttritionService) {}

  @Get('attrition')
  @Roles('researcher', 'coordinator', 'auditor', 'admin')
  @ApiOkResponse({ type: AttritionReportDto })
  report(
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Query() query: AttritionQueryDto,
  ): Promise<AttritionReportDto> {
    return this.attrition.report(studyId, query.comparisonConditionId);
  }

  @Get('export.csv')
  @Roles('researcher', 'coordinator', 'admin')
  @ApiProduces('text/csv')
  @ApiOkResponse({ description: 'One row per enrollment, streamed', schema: { type: 'string' } })
  async exportCsv(
    @CurrentUser() user: SessionUser,
    @Param('studyId', uuidParam('studyId')) studyId: string,
    @Res() response: Response,
  ): Promise<void> {
    // Headers only once the study is known to exist, so that failures before the first row keep the problem shape.
    await this.attrition.writeExport(user, studyId, response, () => {
      response.status(200);
      response.setHeader('Content-Type', 'text/csv; charset=utf-8');
      response.setHeader('Content-Disposition', `attachment; filename="study-${studyId}.csv"`);
      response.setHeader('Cache-Control', 'no-store');
    });
  }
}
