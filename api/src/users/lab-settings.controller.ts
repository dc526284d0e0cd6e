import { Body, Controller, Get, Patch } from '@nestjs/common';
import { ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { AllowedBeforeTwoFactorSetup, CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import { LabSettingsDto, UpdateLabSettingsDto } from './dto/lab-settings.dto';
import { LabSettingsService } from './lab-settings.service';

@ApiTags('lab')
@Controller('lab-settings')
export class LabSettingsController {
  constructor(private readonly settings: LabSettingsService) {}

  @Get()
  @AllowedBeforeTwoFactorSetup()
  @Roles('coordinator', 'researcher', 'auditor', 'admin')
  @ApiOkResponse({ type: LabSettingsDto })
  get(): Promise<LabSettingsDto> {
    return this.settings.get();
  }

  @Patch()
  @Roles('admin')
  @ApiOkResponse({ type: LabSettingsDto })
  update(@CurrentUser() actor: SessionUser, @Body() body: UpdateLabSettingsDto): Promise<LabSettingsDto> {
    return this.settings.update(actor, body);
  }
}
