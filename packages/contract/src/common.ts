/**
 * Building blocks of every payload: ids, free text, e-mail and password rules, the error body and
 * the CSRF header. Request objects are strict everywhere: an unknown field is a 400 naming it.
 */
import { z } from 'zod';

/** Ids are MariaDB INT UNSIGNED AUTO_INCREMENT values; a path id past that range is a 400, not a 404. */
export const MAX_ID = 2_147_483_647;

/** A whole number as people and URLs write it: decimal digits, no sign, leading zero, space or exponent. */
const CANONICAL_DECIMAL = /^(0|[1-9][0-9]{0,15})$/;

/**
 * A whole number from min to max: a JSON number, or a string in canonical decimal (path segments and
 * query parameters are strings). `0x4`, `+4`, `04`, ` 4`, `1e0` and `4.0` are refused: a lenient
 * Number() would read each as 4, and the README promises that a non-numeric id is a 400.
 */
export const decimalIntSchema = (min: number, max: number) =>
  z.unknown().transform((value, ctx): number => {
    const n = typeof value === 'number' ? value : typeof value === 'string' && CANONICAL_DECIMAL.test(value) ? Number(value) : Number.NaN;
    if (!Number.isInteger(n) || n < min || n > max) {
      ctx.addIssue({ code: 'custom', message: `must be a whole number from ${min} to ${max} in plain decimal digits, got ${JSON.stringify(value)?.slice(0, 40) ?? String(value)}` });
      return z.NEVER;
    }
    return n;
  });

export const idSchema = decimalIntSchema(1, MAX_ID);
export const idParamsSchema = z.strictObject({ id: idSchema });

export const isoDateSchema = z.string();
export const sha256Schema = z.string().regex(/^[0-9a-f]{64}$/, 'must be a SHA-256 in lower-case hex');

/**
 * Characters that cannot be typed into a name and only hide or rearrange text where it is shown: C0
 * and C1 controls (U+0085 next line among them), DEL, the line and paragraph separators U+2028/U+2029
 * (a line break inside an e-mail line), and the bidirectional embeddings, overrides and isolates
 * U+202A–U+202E and U+2066–U+2069 (Unicode UAX #9, §2.1–2.2: an override shows "Mallory" as "yrollaM").
 */
// eslint-disable-next-line no-control-regex
export const HIDDEN_TEXT_CHARACTERS = /[\u0000-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069]/;

/**
 * Free text shown to people (project and design titles, display names): stored verbatim, quotes and
 * angle brackets included (the API speaks JSON and the app escapes on display); the hidden characters
 * above are refused.
 */
export const titleSchema = (maxLength: number) =>
  z
    .string()
    .trim()
    .min(1, 'must not be empty')
    .max(maxLength, `must be at most ${maxLength} characters`)
    .refine((value) => !HIDDEN_TEXT_CHARACTERS.test(value), {
      message: 'must not contain control, line-separator or bidirectional-formatting characters (they hide or reorder the text where it is shown)',
    });

export const emailSchema = z.email('must be an e-mail address').max(254).transform((value) => value.toLowerCase());
/** bcrypt reads at most 72 bytes of a password; longer ones would be silently cut, so refuse them. */
export const passwordSchema = z
  .string()
  .min(10, 'must be at least 10 characters')
  .refine((value) => new TextEncoder().encode(value).length <= 72, 'must be at most 72 bytes (bcrypt limit)');

export const ERROR_CODES = [
  'invalid_input',
  'malformed_json',
  'payload_too_large',
  'unsupported_media_type',
  'unauthenticated',
  'forbidden',
  'csrf_rejected',
  'not_found',
  'conflict',
  'stale_revision',
  'rate_limited',
  'server_busy',
  'timeout',
  'database_unavailable',
  'storage_full',
  'internal',
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

export const errorBodySchema = z.strictObject({
  error: z.strictObject({
    code: z.enum(ERROR_CODES),
    message: z.string(),
    field: z.string().optional(),
    /** Present on stale_revision: the design as it is now, so the client can merge or reload. */
    current: z.unknown().optional(),
  }),
});
export type ErrorBody = z.infer<typeof errorBodySchema>;

/** The header every state-changing browser request must carry (packages/api/README.md, "CSRF"). */
export const CSRF_HEADER = 'x-requested-with';
export const CSRF_HEADER_VALUE = 'loopwright';

/** The first difference of a run against the golden vectors (conformance uploads, RTL testbenches). */
export const mismatchSchema = z.object({
  sampleIndex: z.number().int(),
  column: z.string(),
  expected: z.string(),
  got: z.string(),
});
