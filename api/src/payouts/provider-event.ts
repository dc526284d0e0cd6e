import type { FieldError } from '../common/errors/error-codes';

/**
 * How far a webhook's signature timestamp may be from our clock, either way: the SDK's constructEvent tolerance
 * (300 s). The SDK only refuses timestamps too far in the past; one from the future is refused here.
 */
export const SIGNATURE_TOLERANCE_SECONDS = 300;

/** Event types whose `data.object` we apply; each must name its object by `id`. */
export const APPLIED_EVENT_TYPES = new Set([
  'account.updated',
  'transfer.created',
  'transfer.updated',
  'transfer.reversed',
  'payment_intent.succeeded',
  'payment_intent.payment_failed',
]);

/** The parts of a provider event the api relies on, checked. */
export interface ProviderEventEnvelope {
  id: string;
  type: string;
  /** Unix seconds at the provider: the order of events for one object. */
  created: number;
  object: Record<string, unknown>;
  /** The object's id, when it has one (always, for the types we apply). */
  objectId: string | null;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function nonEmptyString(value: unknown): value is string {
  return typeof value === 'string' && value.trim().length > 0;
}

/** Reads a verified webhook body; every missing or wrong part is one field error, named by its path. */
export function readProviderEvent(body: unknown): { event: ProviderEventEnvelope } | { errors: FieldError[] } {
  if (!isRecord(body)) return { errors: [{ field: 'body', message: 'must be a JSON object' }] };
  const errors: FieldError[] = [];
  if (!nonEmptyString(body.id)) errors.push({ field: 'id', message: 'is required: the event id' });
  if (!nonEmptyString(body.type)) errors.push({ field: 'type', message: 'is required: the event type' });
  if (typeof body.created !== 'number' || !Number.isInteger(body.created) || body.created < 0) {
    errors.push({ field: 'created', message: 'is required: unix seconds' });
  }
  if (!isRecord(body.data)) {
    errors.push({ field: 'data', message: 'is required: an object holding data.object' });
    return { errors };
  }
  const object = body.data.object;
  if (!isRecord(object)) {
    errors.push({ field: 'data.object', message: 'is required: the object the event is about' });
    return { errors };
  }
  const objectId = nonEmptyString(object.id) ? object.id : null;
  if (objectId === null && typeof body.type === 'string' && APPLIED_EVENT_TYPES.has(body.type)) {
    errors.push({ field: 'data.object.id', message: `is required for ${body.type}` });
  }
  if (errors.length > 0) return { errors };
  return {
    event: { id: body.id as string, type: body.type as string, created: body.created as number, object, objectId },
  };
}

/** Why a signature header's timestamp is unacceptable at `nowSeconds`, or null when it is within the window. */
export function signatureTimeProblem(
  header: string,
  nowSeconds: number,
  toleranceSeconds = SIGNATURE_TOLERANCE_SECONDS,
): string | null {
  const stamps = header
    .split(',')
    .map((part) => part.trim().split('='))
    .filter(([key]) => key === 't')
    .map(([, value]) => (value !== undefined && /^\d+$/.test(value) ? Number(value) : Number.NaN));
  if (stamps.length !== 1 || !Number.isFinite(stamps[0])) return 'needs exactly one timestamp (t=…)';
  const skew = stamps[0]! - nowSeconds;
  if (Math.abs(skew) > toleranceSeconds) {
    return `timestamp is ${Math.abs(skew)} s ${skew > 0 ? 'ahead of' : 'behind'} our clock; at most ${toleranceSeconds} s is accepted`;
  }
  return null;
}
