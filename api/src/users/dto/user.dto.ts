import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Transform, Type } from 'class-transformer';
import { IsBoolean, IsEmail, IsIn, IsInt, IsOptional, IsString, Max, MaxLength, Min, MinLength } from 'class-validator';
import { STAFF_ROLES, StaffRole, USER_ROLES, UserRole } from '../entities/user.entity';
import { MAX_PAGE } from '../../common/http/paging';

export const MIN_PASSWORD_LENGTH = 12;

const trimmed = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);
const lowerTrimmed = ({ value }: { value: unknown }) =>
  typeof value === 'string' ? value.trim().toLowerCase() : value;

export class StaffUserDto {
  @ApiProperty({ format: 'uuid' }) id: string;
  @ApiProperty() email: string;
  @ApiProperty() name: string;
  @ApiProperty({ enum: USER_ROLES }) role: UserRole;
  @ApiProperty() active: boolean;
  @ApiProperty({ format: 'date-time' }) createdAt: string;
  @ApiProperty({ format: 'date-time', nullable: true, type: String }) lastSignInAt: string | null;
}

export class StaffUserPageDto {
  @ApiProperty({ type: [StaffUserDto] }) items: StaffUserDto[];
  @ApiProperty() total: number;
  @ApiProperty() page: number;
  @ApiProperty() pageSize: number;
}

export class ListUsersQueryDto {
  @ApiPropertyOptional({ description: 'Matches e-mail or name, case-insensitive' })
  @IsOptional()
  @IsString()
  @MaxLength(200)
  search?: string;

  @ApiPropertyOptional({ default: 1 })
  @IsOptional()
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(MAX_PAGE)
  page: number = 1;

  @ApiPropertyOptional({ default: 20 })
  @IsOptional()
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(100)
  pageSize: number = 20;
}

export class CreateStaffUserDto {
  @ApiProperty({ example: 'new.person@lab.test' })
  @Transform(lowerTrimmed)
  @IsEmail({}, { message: 'email must be a valid e-mail address' })
  @MaxLength(254)
  email: string;

  @ApiProperty({ example: 'Robin Example' })
  @Transform(trimmed)
  @IsString()
  @MinLength(1, { message: 'name is required' })
  @MaxLength(200)
  name: string;

  @ApiProperty({ enum: STAFF_ROLES })
  @IsIn(STAFF_ROLES, { message: `role must be one of ${STAFF_ROLES.join(', ')}` })
  role: StaffRole;

  @ApiProperty({ minLength: MIN_PASSWORD_LENGTH })
  @IsString()
  @MinLength(MIN_PASSWORD_LENGTH, { message: `password must be at least ${MIN_PASSWORD_LENGTH} characters` })
  @MaxLength(200)
  password: string;
}

export class UpdateStaffUserDto {
  @ApiPropertyOptional()
  @IsOptional()
  @Transform(trimmed)
  @IsString()
  @MinLength(1, { message: 'name is required' })
  @MaxLength(200)
  name?: string;

  @ApiPropertyOptional({ enum: STAFF_ROLES })
  @IsOptional()
  @IsIn(STAFF_ROLES, { message: `role must be one of ${STAFF_ROLES.join(', ')}` })
  role?: StaffRole;

  @ApiPropertyOptional({ description: 'false deactivates the account' })
  @IsOptional()
  @IsBoolean()
  active?: boolean;
}
