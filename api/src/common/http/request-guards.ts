import { CallHandler, ExecutionContext, Injectable, NestInterceptor } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import type { Observable } from 'rxjs';
import { DomainException, ValidationException } from '../errors/domain.exception';
import { toProblem } from '../errors/problem.filter';
import { inspectParsedInput, UNSTORABLE_TEXT_MESSAGE } from './request-hygiene';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
/** Where @nestjs/swagger keeps a route's `@ApiConsumes(...)`. */
const API_CONSUMES = 'swagger/apiConsumes';

function answer(response: Response, exception: DomainException): void {
  const problem = toProblem(exception);
  response.status(problem.statusCode).json(problem);
}

/**
 * Runs right after the JSON parser and before anything reads the body into classes: refuses nesting too deep to
 * walk and strings PostgreSQL cannot store, in the body, the query string and the path, naming each field.
 */
export function refuseUnreadableInput(): RequestHandler {
  return (request: Request, response: Response, next: NextFunction) => {
    const errors = [
      ...(/%00/.test(request.path) ? [{ field: 'path', message: UNSTORABLE_TEXT_MESSAGE }] : []),
      ...inspectParsedInput(request.query),
      ...(request.body !== undefined && request.body !== null ? inspectParsedInput(request.body) : []),
    ];
    if (errors.length > 0) return answer(response, new ValidationException(errors));
    next();
  };
}

/**
 * Cross-site request refusal: a state-changing request that names an origin must come from the portal, the staff
 * app or the api itself. Browsers always send Origin on such requests; clients that send none (scripts, the payment
 * provider's webhook, the test suites) are not browsers and carry no ambient cookies to abuse.
 */
export function refuseForeignOrigins(allowedUrls: string[]): RequestHandler {
  const allowed = new Set(allowedUrls.map((url) => new URL(url).origin));
  return (request: Request, response: Response, next: NextFunction) => {
    if (SAFE_METHODS.has(request.method)) return next();
    const origin = request.get('origin');
    if (origin === undefined || allowed.has(origin) || origin === `${request.protocol}://${request.get('host')}`)
      return next();
    answer(response, new DomainException('FORBIDDEN', 'This request came from a site that may not act on Evenhand.'));
  };
}

function hasBody(request: Request): boolean {
  return request.headers['transfer-encoding'] !== undefined || Number(request.headers['content-length'] ?? 0) > 0;
}

/**
 * A body must be in a media type the route declares: `application/json` unless the route says otherwise with
 * `@ApiConsumes` (the multipart uploads). So a cross-site HTML form (form-encoded, multipart or text/plain) cannot
 * reach a JSON route. An interceptor rather than a guard, so sign-in, role and membership are checked first and an
 * outsider learns nothing about a route.
 */
@Injectable()
export class MediaTypeInterceptor implements NestInterceptor {
  constructor(private readonly reflector: Reflector) {}

  intercept(context: ExecutionContext, next: CallHandler): Observable<unknown> {
    const request = context.switchToHttp().getRequest<Request>();
    if (hasBody(request)) {
      const declared = this.reflector.getAllAndOverride<string[] | undefined>(API_CONSUMES, [
        context.getHandler(),
        context.getClass(),
      ]) ?? ['application/json'];
      const mediaType = (request.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
      if (!declared.includes(mediaType)) {
        throw new DomainException(
          'UNSUPPORTED_MEDIA_TYPE',
          `This route takes a body of type ${declared.join(' or ')}.`,
        );
      }
    }
    return next.handle();
  }
}
