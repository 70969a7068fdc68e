/**
 * Building blocks of every payload: ids, free text, e-mail and password rules, the error body and
 * the CSRF header. Request objects are strict everywhere: an unknown field is a 400 naming it.
 */
import { z } from 'zod';

/** Ids are MariaDB INT UNSIGNED AUTO_INCREMENT values; a path id past that range is a 400, not a 404. */
export const MAX_ID = 2_147_483_647;
export const idSchema = z.coerce.number().int().min(1).max(MAX_ID);
export const idParamsSchema = z.strictObject({ id: idSchema });

export const isoDateSchema = z.string();
export const sha256Schema = z.string().regex(/^[0-9a-f]{64}$/, 'must be a SHA-256 in lower-case hex');

/**
 * Free text shown to people (project and design titles): stored verbatim, quotes and angle brackets
 * included (the API speaks JSON and the app escapes on display); control characters are refused
 * because they cannot be typed and only hide text.
 */
export const titleSchema = (maxLength: number) =>
  z
    .string()
    .trim()
    .min(1, 'must not be empty')
    .max(maxLength, `must be at most ${maxLength} characters`)
    // eslint-disable-next-line no-control-regex
    .regex(/^[^\u0000-\u001f\u007f]*$/, 'must not contain control characters');

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
