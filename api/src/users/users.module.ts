import { Module } from '@nestjs/common';
import { AuditModule } from '../audit';
import { LabSettingsController } from './lab-settings.controller';
import { LabSettingsService } from './lab-settings.service';
import { UsersController } from './users.controller';
import { UsersService } from './users.service';

@Module({
  imports: [AuditModule],
  controllers: [UsersController, LabSettingsController],
  providers: [UsersService, LabSettingsService],
  exports: [UsersService, LabSettingsService],
})
export class UsersModule {}
