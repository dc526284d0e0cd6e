import { ValidationError, ValidationPipe } from '@nestjs/common';
import type { ValidatorOptions } from 'class-validator';
import { ValidationException } from '../errors/domain.exception';
import { FieldError } from '../errors/error-codes';

/** Where @nestjs/swagger keeps each property's `@ApiProperty(...)` options. */
const API_MODEL_PROPERTIES = 'swagger/apiModelProperties';

function flatten(errors: ValidationError[], parent = ''): FieldError[] {
  return errors.flatMap((error) => {
    const field = parent ? `${parent}.${error.property}` : error.property;
    const own = Object.values(error.constraints ?? {}).map((message) => ({
      field,
      message: message.startsWith('property ') ? `${field} is not an allowed field` : message,
    }));
    return [...own, ...flatten(error.children ?? [], field)];
  });
}

function isDtoInstance(value: unknown): value is object {
  return (
    typeof value === 'object' &&
    value !== null &&
    !Array.isArray(value) &&
    Object.getPrototypeOf(value) !== Object.prototype
  );
}

/**
 * `@IsOptional()` lets null through as well as a missing field, and a null then reaches a NOT NULL column. Here a
 * null is refused unless the contract says the field may be null (`@ApiProperty({ nullable: true })`), in every DTO
 * and every nested DTO, so the rule holds on every route without repeating it on each field.
 */
export function nullFieldErrors(dto: object, parent = ''): FieldError[] {
  const errors: FieldError[] = [];
  for (const [key, value] of Object.entries(dto)) {
    const field = parent ? `${parent}.${key}` : key;
    if (value === null) {
      const options = Reflect.getMetadata(API_MODEL_PROPERTIES, Object.getPrototypeOf(dto), key) as
        { nullable?: boolean } | undefined;
      if (!options?.nullable) errors.push({ field, message: `${field} may not be null; leave it out instead` });
    } else if (Array.isArray(value)) {
      value.forEach((item, index) => {
        if (isDtoInstance(item)) errors.push(...nullFieldErrors(item, `${field}.${index}`));
      });
    } else if (isDtoInstance(value)) {
      errors.push(...nullFieldErrors(value, field));
    }
  }
  return errors;
}

class EvenhandValidationPipe extends ValidationPipe {
  protected override async validate(object: object, validatorOptions?: ValidatorOptions): Promise<ValidationError[]> {
    const errors = await super.validate(object, validatorOptions);
    const reported = new Set(flatten(errors).map((error) => error.field));
    const nulls = isDtoInstance(object) ? nullFieldErrors(object).filter((error) => !reported.has(error.field)) : [];
    // Dotted property names flatten to the same field path as nested class-validator errors.
    return [
      ...errors,
      ...nulls.map((error): ValidationError => ({
        property: error.field,
        constraints: { isNotNull: error.message },
        children: [],
      })),
    ];
  }
}

/** The one global pipe: unknown fields and misplaced nulls are refused, every problem is named by its field. */
export function createValidationPipe(): ValidationPipe {
  return new EvenhandValidationPipe({
    whitelist: true,
    forbidNonWhitelisted: true,
    transform: true,
    // One message per field: the first rule it breaks.
    stopAtFirstError: true,
    exceptionFactory: (errors) => new ValidationException(flatten(errors)),
  });
}
