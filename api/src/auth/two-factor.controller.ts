import { Body, Controller, Delete, Get, HttpCode, Post } from '@nestjs/common';
import { ApiNoContentResponse, ApiOkResponse, ApiTags } from '@nestjs/swagger';
import { AllowedBeforeTwoFactorSetup, CurrentUser, Roles } from '../common/auth/auth.decorators';
import type { SessionUser } from '../common/auth/session-user';
import {
  ConfirmTwoFactorDto,
  ConfirmWithPasswordDto,
  RecoveryCodesDto,
  TwoFactorSetupDto,
  TwoFactorStatusDto,
} from './dto/two-factor.dto';
import { TwoFactorService } from './two-factor.service';

@ApiTags('auth')
@Roles('coordinator', 'researcher', 'auditor', 'admin')
@AllowedBeforeTwoFactorSetup()
@Controller('auth/two-factor')
export class TwoFactorController {
  constructor(private readonly twoFactor: TwoFactorService) {}

  @Get()
  @ApiOkResponse({ type: TwoFactorStatusDto })
  status(@CurrentUser() user: SessionUser): Promise<TwoFactorStatusDto> {
    return this.twoFactor.status(user);
  }

  @Post('setup')
  @HttpCode(200)
  @ApiOkResponse({
    type: TwoFactorSetupDto,
    description: 'A new secret and its QR code; nothing changes until a code from it is confirmed',
  })
  setup(@CurrentUser() user: SessionUser): Promise<TwoFactorSetupDto> {
    return this.twoFactor.beginSetup(user);
  }

  @Post('confirm')
  @HttpCode(200)
  @ApiOkResponse({
    type: RecoveryCodesDto,
    description: 'Two-factor sign-in is on; the recovery codes are shown this once',
  })
  confirm(@CurrentUser() user: SessionUser, @Body() body: ConfirmTwoFactorDto): Promise<RecoveryCodesDto> {
    return this.twoFactor.confirmSetup(user, body);
  }

  @Post('recovery-codes')
  @HttpCode(200)
  @ApiOkResponse({ type: RecoveryCodesDto, description: 'New recovery codes; every earlier one stops working' })
  renewRecoveryCodes(
    @CurrentUser() user: SessionUser,
    @Body() body: ConfirmWithPasswordDto,
  ): Promise<RecoveryCodesDto> {
    return this.twoFactor.renewRecoveryCodes(user, body.password);
  }

  @Delete()
  @HttpCode(204)
  @ApiNoContentResponse({ description: 'Two-factor sign-in is off and the recovery codes are gone' })
  disable(@CurrentUser() user: SessionUser, @Body() body: ConfirmWithPasswordDto): Promise<void> {
    return this.twoFactor.disable(user, body.password);
  }
}
