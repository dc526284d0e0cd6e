import { ApiProperty } from '@nestjs/swagger';
import { Transform } from 'class-transformer';
import { IsString, Length } from 'class-validator';

const trimmed = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class UndoLostDto {
  @ApiProperty({ description: 'Why the person is taking part again; kept in the audit trail' })
  @Transform(trimmed)
  @IsString()
  @Length(5, 1000, { message: 'reason must say in at least 5 characters why the person is taking part again' })
  reason: string;
}
