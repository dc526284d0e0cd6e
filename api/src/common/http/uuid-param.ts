import { ParseUUIDPipe } from '@nestjs/common';
import { ValidationException } from '../errors/domain.exception';

/** A path id that must be a UUID; a malformed one is a 400 naming the parameter. */
export function uuidParam(name: string): ParseUUIDPipe {
  return new ParseUUIDPipe({
    exceptionFactory: () => new ValidationException([{ field: name, message: 'must be a UUID' }]),
  });
}
