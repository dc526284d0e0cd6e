import { ApiProperty } from '@nestjs/swagger';
import { IsString, Matches, MaxLength, MinLength } from 'class-validator';

export class TwoFactorStatusDto {
  @ApiProperty() enabled: boolean;
  @ApiProperty({ format: 'date-time', nullable: true, type: String }) enabledAt: string | null;
  @ApiProperty({ description: 'Recovery codes not used yet' }) recoveryCodesLeft: number;
  @ApiProperty({ description: 'The lab requires it of this person (an admin, with the lab setting on)' })
  required: boolean;
}

/** The secret is shown here once, at set-up, and never returned again. */
export class TwoFactorSetupDto {
  @ApiProperty({ description: 'Base32 secret, for typing into an authenticator app by hand' }) secret: string;
  @ApiProperty({ description: 'otpauth:// address the QR code carries' }) otpauthUrl: string;
  @ApiProperty({ description: 'The QR code as an SVG data URL, made on the server' }) qrCodeDataUrl: string;
}

export class ConfirmTwoFactorDto {
  @ApiProperty({ example: '123456' })
  @IsString()
  @Matches(/^\s*\d{3}\s?\d{3}\s*$/, { message: 'code must be the 6 digits your authenticator app shows' })
  code: string;
}

export class RecoveryCodesDto {
  @ApiProperty({ type: [String], description: 'Shown once; only their hashes are kept' }) recoveryCodes: string[];
}

export class ConfirmWithPasswordDto {
  @ApiProperty()
  @IsString()
  @MinLength(1, { message: 'password is required' })
  @MaxLength(200)
  password: string;
}
