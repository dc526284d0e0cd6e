import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { MailModule } from '../mail/mail.module';
import { StudiesModule } from '../studies';
import { AttritionAlertsController } from './alerts/attrition-alerts.controller';
import { AttritionAlertsService } from './alerts/attrition-alerts.service';
import { AttritionController } from './attrition.controller';
import { AttritionService } from './attrition.service';
import { AttritionSummaryService } from './attrition-summary.service';

/**
 * The dropout watch: the report, the export and the alerts, computed by the plain modules here from a summary the
 * database keeps up to date (migration 1764700800000-attrition-summary).
 */
@Module({
  imports: [AuditModule, MailModule, StudiesModule],
  controllers: [AttritionController, AttritionAlertsController],
  providers: [AttritionService, AttritionAlertsService, AttritionSummaryService],
  exports: [AttritionService, AttritionAlertsService, AttritionSummaryService],
})
export class AttritionModule {}
