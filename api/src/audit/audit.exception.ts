import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the audit domain refuses a request: only the refusals every domain shares. */
export type AuditRefusal = CommonRefusal;

/** A refusal of the audit domain, answered by the problem filter with its own code. */
export class AuditException extends DomainException<AuditRefusal> {}
