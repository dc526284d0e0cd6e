import { ApiError, toApiProblem } from '@evenhand/contract';

// The problem shape, its codes and the error class are the contract's (api/contract/src/problem.ts).
export { ApiError, isApiError } from '@evenhand/contract';
export type { ApiProblem } from '@evenhand/contract';

/** Turns whatever came back with a failed response into an ApiError, even when the body is not the usual shape. */
export function toApiError(body: unknown, response: Response): ApiError {
  return new ApiError(toApiProblem(response.status, body));
}
