import 'reflect-metadata';
import { ApiProperty, ApiPropertyOptional } from '@nestjs/swagger';
import { Type } from 'class-transformer';
import { IsInt, IsOptional, IsString, MaxLength, ValidateIf, ValidateNested } from 'class-validator';
import { describe, expect, it } from 'vitest';
import { ValidationException } from '../errors/domain.exception';
import { createValidationPipe } from './validation';

class ItemDto {
  @ApiPropertyOptional() @IsOptional() @IsString() @MaxLength(20) label?: string;
}

class ExampleDto {
  @ApiPropertyOptional() @IsOptional() @IsString() @MaxLength(20) title?: string;
  @ApiPropertyOptional({ nullable: true, type: Number })
  @ValidateIf((o: ExampleDto) => o.dueDays !== null && o.dueDays !== undefined)
  @IsInt()
  dueDays?: number | null;
  @ApiProperty() @IsString() name: string;
  @ApiPropertyOptional({ type: [ItemDto] })
  @IsOptional()
  @ValidateNested({ each: true })
  @Type(() => ItemDto)
  items?: ItemDto[];
}

async function fieldErrors(body: unknown) {
  try {
    await createValidationPipe().transform(body, { type: 'body', metatype: ExampleDto });
    return [];
  } catch (error) {
    expect(error).toBeInstanceOf(ValidationException);
    return (error as ValidationException).errors!;
  }
}

describe('the global validation pipe', () => {
  it('refuses null in an optional field that may not be null, naming it', async () => {
    expect(await fieldErrors({ name: 'n', title: null })).toEqual([
      { field: 'title', message: 'title may not be null; leave it out instead' },
    ]);
  });

  it('takes null where the contract marks the field nullable', async () => {
    expect(await fieldErrors({ name: 'n', dueDays: null })).toEqual([]);
  });

  it('reports a required field given null once, by its own rule', async () => {
    expect(await fieldErrors({ name: null })).toEqual([{ field: 'name', message: 'name must be a string' }]);
  });

  it('refuses null inside nested DTOs with the nested path', async () => {
    expect((await fieldErrors({ name: 'n', items: [{ label: 'a' }, { label: null }] })).map((e) => e.field)).toEqual([
      'items.1.label',
    ]);
  });
});
