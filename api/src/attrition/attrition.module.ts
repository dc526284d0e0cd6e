import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { MailModule } from '../mail/mail.module';
import { StudiesModule } from '../studies';
import { AttritionAlertsController } from './alerts/attrition-alerts.controller';
import { AttritionAlertsService } from './alerts/attrition-alerts.service';
import { AttritionController } from './attrition.controller';
import { AttritionService } from './attrition.service';

/** The dropout watch: the report, the export and the alerts, computed from SQL aggregates by the plain modules here. */
@Module({
  imports: [AuditModule, MailModule, StudiesModule],
  controllers: [AttritionController, AttritionAlertsController],
  providers: [AttritionService, AttritionAlertsService],
  exports: [AttritionService, AttritionAlertsService],
})
export class AttritionModule {}
