import { ArgumentsHost, Catch, ExceptionFilter, HttpException, HttpStatus, Logger } from '@nestjs/common';
import { ThrottlerException } from '@nestjs/throttler';
import type { Response } from 'express';
import { DomainException } from './domain.exception';
import { ErrorCode, HTTP_STATUS_BY_CODE, Problem } from './error-codes';
import { InvalidInputError } from './invalid-input.error';

const CODE_BY_HTTP_STATUS: Partial<Record<number, ErrorCode>> = {
  400: 'BAD_REQUEST',
  401: 'UNAUTHENTICATED',
  403: 'FORBIDDEN',
  404: 'NOT_FOUND',
  409: 'CONFLICT',
  413: 'PAYLOAD_TOO_LARGE',
  415: 'UNSUPPORTED_MEDIA_TYPE',
  429: 'RATE_LIMITED',
  503: 'UNAVAILABLE',
};

/** Turns anything thrown while handling a request into the api's one problem shape. */
export function toProblem(exception: unknown): Problem {
  if (exception instanceof DomainException) {
    const code: ErrorCode = exception.code;
    const problem: Problem = {
      statusCode: HTTP_STATUS_BY_CODE[code],
      code,
      message: exception.message,
      ...(exception.details ?? {}),
    };
    if (exception.errors) problem.errors = exception.errors;
    return problem;
  }
  if (exception instanceof InvalidInputError) {
    return { statusCode: 400, code: 'VALIDATION_FAILED', message: exception.summary, errors: exception.fieldErrors };
  }
  if (exception instanceof ThrottlerException) {
    return {
      statusCode: 429,
      code: 'RATE_LIMITED',
      message: 'Too many attempts. Please wait a few minutes and try again.',
    };
  }
  if (exception instanceof HttpException) {
    const statusCode = exception.getStatus();
    const body = exception.getResponse();
    const message =
      typeof body === 'string'
        ? body
        : Array.isArray((body as { message?: unknown }).message)
          ? (body as { message: string[] }).message.join('; ')
          : String((body as { message?: unknown }).message ?? exception.message);
    const code = CODE_BY_HTTP_STATUS[statusCode] ?? (statusCode >= 500 ? 'INTERNAL' : 'BAD_REQUEST');
    return {
      statusCode,
      code,
      message: statusCode === 404 && message.startsWith('Cannot ') ? 'No such route.' : message,
    };
  }
  return {
    statusCode: HttpStatus.INTERNAL_SERVER_ERROR,
    code: 'INTERNAL',
    message: 'Something went wrong on our side.',
  };
}

@Catch()
export class ProblemFilter implements ExceptionFilter {
  private readonly logger = new Logger('Problem');

  catch(exception: unknown, host: ArgumentsHost): void {
    const response = host.switchToHttp().getResponse<Response>();
    const problem = toProblem(exception);
    if (problem.statusCode >= 500) this.logger.error(exception instanceof Error ? exception.stack : String(exception));
    if (response.headersSent) return;
    response.status(problem.statusCode).json(problem);
  }
}
