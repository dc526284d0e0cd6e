// The provider's error object and HTTP statuses, as published at
// https://docs.stripe.com/api/errors (type, code, message, param, doc_url, decline_code)
// and https://docs.stripe.com/error-codes (the code strings). Messages are our own wording.

export type ProviderErrorType = 'api_error' | 'card_error' | 'idempotency_error' | 'invalid_request_error';

export interface ProviderErrorBody {
  type: ProviderErrorType;
  message: string;
  code?: string;
  param?: string;
  decline_code?: string;
  doc_url?: string;
  payment_intent?: unknown;
}

export interface ProviderErrorOptions {
  /**
   * Whether an idempotent request that ended in this error keeps the error for replay.
   * The provider saves a result only once the endpoint has started executing; requests that
   * fail parameter validation or clash with a concurrent request are not saved
   * (https://docs.stripe.com/api/idempotent_requests).
   */
  storable?: boolean;
  headers?: Record<string, string>;
}

export class ProviderError extends Error {
  readonly storable: boolean;
  readonly headers: Record<string, string>;

  constructor(
    readonly status: number,
    readonly body: ProviderErrorBody,
    options: ProviderErrorOptions = {},
  ) {
    super(body.message);
    this.name = 'ProviderError';
    this.storable = options.storable ?? true;
    this.headers = options.headers ?? {};
  }

  toJSON(): { error: ProviderErrorBody } {
    return { error: this.body };
  }
}

function docUrl(code: string): string {
  return `https://docs.stripe.com/error-codes/${code.replace(/_/g, '-')}`;
}

function invalidRequest(
  status: number,
  message: string,
  extra: { code?: string; param?: string } = {},
  options: ProviderErrorOptions = {},
): ProviderError {
  const body: ProviderErrorBody = { type: 'invalid_request_error', message };
  if (extra.code) {
    body.code = extra.code;
    body.doc_url = docUrl(extra.code);
  }
  if (extra.param) body.param = extra.param;
  return new ProviderError(status, body, options);
}

/** A parameter problem: a 400 that an idempotency key does not keep. */
function parameterProblem(message: string, param: string, code?: string): ProviderError {
  return invalidRequest(400, message, { code, param }, { storable: false });
}

export const providerErrors = {
  missingApiKey: () =>
    invalidRequest(
      401,
      'You did not provide an API key. Send it in the Authorization header as a Bearer token or as the user name of Basic auth.',
      {},
      { storable: false },
    ),

  invalidApiKey: (maskedKey: string) =>
    invalidRequest(401, `Invalid API Key provided: ${maskedKey}`, { code: 'api_key_invalid' }, { storable: false }),

  /** A publishable key on an endpoint only a secret key may call: the provider answers 403 secret_key_required. */
  secretKeyRequired: () =>
    invalidRequest(
      403,
      'This request needs a secret API key (sk_test_…). A publishable key can only confirm or retrieve a PaymentIntent with its client_secret.',
      { code: 'secret_key_required' },
      { storable: false },
    ),

  accountInvalid: (maskedKey: string, accountId: string) =>
    invalidRequest(
      403,
      `The provided key '${maskedKey}' does not have access to account '${accountId}' (or that account does not exist).`,
      { code: 'account_invalid' },
    ),

  unrecognizedUrl: (method: string, path: string) =>
    invalidRequest(404, `Unrecognized request URL (${method}: ${path}).`, {}, { storable: false }),

  wrongContentType: (contentType: string) =>
    invalidRequest(
      400,
      `Invalid request: the body must be sent as application/x-www-form-urlencoded, not ${contentType}.`,
      {},
      { storable: false },
    ),

  malformedBody: (detail: string) => invalidRequest(400, `Invalid request body: ${detail}`, {}, { storable: false }),

  parameterMissing: (param: string) =>
    parameterProblem(`Missing required param: ${param}.`, param, 'parameter_missing'),

  parameterUnknown: (param: string) =>
    parameterProblem(`Received unknown parameter: ${param}`, param, 'parameter_unknown'),

  parameterEmpty: (param: string) =>
    parameterProblem(
      `You passed an empty string for '${param}'. An empty value asks to unset a parameter, but '${param}' cannot be unset. Remove it from the request or send a value.`,
      param,
      'parameter_invalid_empty',
    ),

  invalidInteger: (param: string, value: string) =>
    parameterProblem(`Invalid integer: ${value}`, param, 'parameter_invalid_integer'),

  integerTooSmall: (param: string, minimum: number) =>
    parameterProblem(`This value must be greater than or equal to ${minimum}.`, param, 'parameter_invalid_integer'),

  integerTooLarge: (param: string, maximum: number) =>
    parameterProblem(`This value must be less than or equal to ${maximum}.`, param, 'parameter_invalid_integer'),

  invalidBoolean: (param: string, value: string) =>
    parameterProblem(`Invalid boolean: ${value}. Send true or false.`, param),

  invalidString: (param: string) => parameterProblem(`Invalid string: ${param} must be a single text value.`, param),

  invalidObject: (param: string) =>
    parameterProblem(`Invalid object: ${param} must be a hash of keys and values.`, param),

  invalidArray: (param: string) => parameterProblem(`Invalid array: ${param} must be a list of values.`, param),

  stringTooLong: (param: string, maximum: number) =>
    parameterProblem(`Invalid string: ${param} must be at most ${maximum} characters long.`, param),

  invalidEnum: (param: string, allowed: readonly string[]) =>
    parameterProblem(`Invalid ${param}: must be one of ${allowed.join(', ')}`, param),

  invalidCurrency: (param: string, value: string) =>
    parameterProblem(
      `Invalid currency: ${value}. Send a three-letter ISO 4217 code in lower case, such as usd.`,
      param,
    ),

  invalidCountry: (param: string, value: string) =>
    parameterProblem(`Country '${value}' is unknown. Send a two-letter ISO 3166-1 code such as 'US' or 'GB'.`, param),

  invalidEmail: (param: string, value: string) =>
    parameterProblem(`Invalid email address: ${value}`, param, 'email_invalid'),

  invalidUrl: (param: string, value: string) => parameterProblem(`Not a valid URL: ${value}`, param, 'url_invalid'),

  metadataProblem: (param: string, message: string) => parameterProblem(message, param),

  parametersExclusive: (params: readonly string[]) =>
    parameterProblem(
      `You may only specify one of these parameters: ${params.join(', ')}.`,
      params[params.length - 1] ?? '',
    ),

  notExpandable: (path: string) => parameterProblem(`This property cannot be expanded (${path}).`, 'expand'),

  resourceMissing: (objectName: string, id: string, param = 'id') =>
    invalidRequest(404, `No such ${objectName}: '${id}'`, { code: 'resource_missing', param }),

  /** A referenced object (not the one in the path) that does not exist: a 400, as for `destination`. */
  referenceMissing: (objectName: string, id: string, param: string) =>
    invalidRequest(400, `No such ${objectName}: '${id}'`, { code: 'resource_missing', param }),

  clientSecretMismatch: () =>
    parameterProblem('The client_secret does not belong to this PaymentIntent.', 'client_secret'),

  /** Raw card numbers only come from the browser script, as the provider keeps them away from servers. */
  cardDataNeedsPublishableKey: () =>
    parameterProblem(
      'Card numbers are only accepted from the browser with a publishable key. On a server, confirm with a test payment method such as pm_card_visa.',
      'payment_method_data[card]',
    ),

  /** A card the issuer would refuse before any charge is tried (wrong number, past expiry, bad CVC): a 402. */
  cardRejected: (code: string, message: string, param: string) =>
    new ProviderError(402, { type: 'card_error', code, message, param, doc_url: docUrl(code) }),

  balanceInsufficient: (currency: string) =>
    invalidRequest(400, `The available balance in ${currency} is too low for this request. Add funds first.`, {
      code: 'balance_insufficient',
    }),

  insufficientCapabilitiesForTransfer: (accountId: string) =>
    invalidRequest(
      400,
      `The destination account ${accountId} needs the transfers capability to be active before it can receive transfers.`,
      { code: 'insufficient_capabilities_for_transfer', param: 'destination' },
    ),

  payoutsNotAllowed: (accountId: string) =>
    invalidRequest(400, `Payouts are not enabled for account ${accountId} yet.`, { code: 'payouts_not_allowed' }),

  amountTooSmall: (param: string, minimum: number, currency: string) =>
    invalidRequest(400, `Amount must be at least ${minimum} in the smallest unit of ${currency}.`, {
      code: 'amount_too_small',
      param,
    }),

  transferReversalTooLarge: (available: number) =>
    invalidRequest(400, `The reversal amount is larger than what remains of the transfer (${available}).`, {
      code: 'parameter_invalid_integer',
      param: 'amount',
    }),

  unexpectedState: (message: string, code: string, param?: string) => invalidRequest(400, message, { code, param }),

  onlyOnPlatform: () =>
    invalidRequest(
      400,
      'This request is made by the platform account and cannot be sent with a Stripe-Account header.',
    ),

  idempotencyParamsMismatch: (key: string) =>
    new ProviderError(
      400,
      {
        type: 'idempotency_error',
        message: `Keys for idempotent requests can only be used with the same parameters they were first used with. Use a key other than '${key}' for a different request.`,
      },
      { storable: false },
    ),

  idempotencyEndpointMismatch: (key: string, firstEndpoint: string, thisEndpoint: string) =>
    new ProviderError(
      400,
      {
        type: 'idempotency_error',
        message: `Keys for idempotent requests can only be used for the same endpoint they were first used for ('${firstEndpoint}' vs '${thisEndpoint}'). Use a key other than '${key}' for a different request.`,
      },
      { storable: false },
    ),

  idempotencyKeyInUse: () =>
    invalidRequest(
      409,
      'Another request with this idempotency key is still in progress. Try again later.',
      { code: 'idempotency_key_in_use' },
      { storable: false },
    ),

  idempotencyKeyTooLong: () =>
    invalidRequest(400, 'Idempotency keys can be at most 255 characters long.', {}, { storable: false }),

  rateLimited: () =>
    invalidRequest(
      429,
      'Too many requests hit the API too quickly. Back off and retry later.',
      { code: 'rate_limit' },
      { storable: false },
    ),

  apiError: (message = 'Something went wrong on our end while handling the request.') =>
    new ProviderError(500, { type: 'api_error', message }, { storable: false }),
};
