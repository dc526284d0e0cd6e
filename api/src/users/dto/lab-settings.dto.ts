import { ApiProperty } from '@nestjs/swagger';
import { IsBoolean } from 'class-validator';

export class LabSettingsDto {
  @ApiProperty({
    description: 'Admins must sign in with a two-factor code; an admin without one can only set it up until they do',
  })
  twoFactorRequiredForAdmins: boolean;

  @ApiProperty({ format: 'date-time' }) updatedAt: string;
}

export class UpdateLabSettingsDto {
  @ApiProperty()
  @IsBoolean({ message: 'twoFactorRequiredForAdmins must be true or false' })
  twoFactorRequiredForAdmins: boolean;
}
