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
