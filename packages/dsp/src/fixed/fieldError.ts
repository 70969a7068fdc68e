/**
 * An input error that names the offending field (dot path, as parseLoopSpec reports it), so the API
 * can answer `{ error: { code, message, field } }` without guessing.
 */
export class FieldError extends Error {
  readonly field: string;
  constructor(field: string, message: string) {
    super(message.startsWith(field) ? message : `${field}: ${message}`);
    this.name = 'FieldError';
    this.field = field;
  }
}

/** Throws a FieldError unless `value` is an integer in [min, max]. */
export function requireIntIn(field: string, value: number, min: number, max: number): void {
  if (!Number.isInteger(value) || value < min || value > max) {
    throw new FieldError(field, `${field} must be an integer in [${min}, ${max}], got ${String(value)}`);
  }
}

/** Throws a FieldError unless `value` is a finite number. */
export function requireFinite(field: string, value: number): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new FieldError(field, `${field} must be a finite number, got ${String(value)}`);
  }
}
