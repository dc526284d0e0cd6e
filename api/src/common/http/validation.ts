import { ValidationError, ValidationPipe } from '@nestjs/common';
import { ValidationException } from '../errors/domain.exception';
import { FieldError } from '../errors/error-codes';

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

/** The one global pipe: unknown fields are refused, every problem is named by its field. */
export function createValidationPipe(): ValidationPipe {
  return new ValidationPipe({
    whitelist: true,
    forbidNonWhitelisted: true,
    transform: true,
    // One message per field: the first rule it breaks.
    stopAtFirstError: true,
    exceptionFactory: (errors) => new ValidationException(flatten(errors)),
  });
}
