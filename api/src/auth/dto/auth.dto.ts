import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsEmail, IsOptional, IsString, Matches, MaxLength, MinLength } from 'class-validator';
import { USER_ROLES, UserRole } from '../../users';
import { MIN_PASSWORD_LENGTH } from '../../users';

const lowerTrimmed = ({ value }: { value: unknown }) =>
  typeof value === 'string' ? value.trim().toLowerCase() : value;

export class SignInDto {
  @ApiProperty({ example: 'coordinator@evenhand.test' })
  @Transform(lowerTrimmed)
  @IsEmail({}, { message: 'email must be a valid e-mail address' })
  @MaxLength(254)
  email: string;

  @ApiProperty()
  @IsString()
  @MinLength(1, { message: 'password is required' })
  @MaxLength(200)
  password: string;

  @ApiPropertyOptional({
    description: 'The 6-digit code from the authenticator app, when the account has two-factor sign-in on',
    example: '123456',
  })
  @IsOptional()
  @IsString()
  @Matches(/^\s*\d{3}\s?\d{3}\s*$/, { message: 'code must be the 6 digits your authenticator app shows' })
  code?: string;

  @ApiPropertyOptional({
    description: 'One of the recovery codes given when two-factor sign-in was turned on; each works once',
  })
  @IsOptional()
  @IsString()
  @MinLength(1, { message: 'recoveryCode is required' })
  @MaxLength(40, { message: 'recoveryCode is longer than any recovery code' })
  recoveryCode?: string;
}

export class RequestSignInLinkDto {
  @ApiProperty({ example: 'someone@example.test' })
  @Transform(lowerTrimmed)
  @IsEmail({}, { message: 'email must be a valid e-mail address' })
  @MaxLength(254)
  email: string;

  @ApiPropertyOptional({ description: 'The study page the person came from, so the link brings them back to it' })
  @IsOptional()
  @IsString()
  @Matches(/^[a-z0-9-]{1,80}$/, { message: 'studySlug must be lower-case letters, digits and dashes' })
  studySlug?: string;
}

export class ConsumeSignInLinkDto {
  @ApiProperty()
  @IsString()
  @MinLength(20, { message: 'token is not a sign-in token' })
  @MaxLength(200)
  token: string;
}

export class MeDto {
  @ApiProperty({ format: 'uuid' }) id: string;
  @ApiProperty() email: string;
  @ApiProperty() name: string;
  @ApiProperty({ enum: USER_ROLES }) role: UserRole;
  @ApiProperty() active: boolean;
  @ApiProperty({ description: 'The person signs in with a two-factor code as well as a password' })
  twoFactorEnabled: boolean;
  @ApiProperty({ description: 'The lab requires two-factor sign-in of admins and this admin has not set it up yet' })
  twoFactorSetupNeeded: boolean;
}

export class SessionDto {
  @ApiProperty({ type: MeDto }) user: MeDto;
  @ApiPropertyOptional({ description: 'Study page to return to after a link sign-in', nullable: true, type: String })
  studySlug?: string | null;
}

export class LinkRequestedDto {
  @ApiProperty({ description: 'Always true: the answer never reveals whether an address is known' }) sent: boolean;
}

const NEW_PASSWORD_MESSAGE = `newPassword must be at least ${MIN_PASSWORD_LENGTH} characters`;

export class ChangePasswordDto {
  @ApiProperty()
  @IsString()
  @MinLength(1, { message: 'currentPassword is required' })
  @MaxLength(200)
  currentPassword: string;

  @ApiProperty({ minLength: MIN_PASSWORD_LENGTH })
  @IsString()
  @MinLength(MIN_PASSWORD_LENGTH, { message: NEW_PASSWORD_MESSAGE })
  @MaxLength(200)
  newPassword: string;
}

export class RequestPasswordResetDto {
  @ApiProperty({ example: 'coordinator@evenhand.test' })
  @Transform(lowerTrimmed)
  @IsEmail({}, { message: 'email must be a valid e-mail address' })
  @MaxLength(254)
  email: string;
}

export class ConsumePasswordResetDto {
  @ApiProperty()
  @IsString()
  @MinLength(20, { message: 'token is not from a password-reset link' })
  @MaxLength(200)
  token: string;

  @ApiProperty({ minLength: MIN_PASSWORD_LENGTH })
  @IsString()
  @MinLength(MIN_PASSWORD_LENGTH, { message: NEW_PASSWORD_MESSAGE })
  @MaxLength(200)
  newPassword: string;
}
