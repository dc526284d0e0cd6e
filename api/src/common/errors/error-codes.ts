// The codes, their statuses and the problem shape are part of the contract the apps share (api/contract).
export { HTTP_STATUS_BY_CODE } from '@evenhand/contract';
export type { ErrorCode, FieldError, Problem } from '@evenhand/contract';
