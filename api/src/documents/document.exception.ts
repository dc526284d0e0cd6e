import { CommonRefusal, DomainException } from '../common/errors/domain.exception';

/** Why the documents domain refuses a request: only the refusals every domain shares. */
export type DocumentRefusal = CommonRefusal;

/** A refusal of the documents domain, answered by the problem filter with its own code. */
export class DocumentException extends DomainException<DocumentRefusal> {}
