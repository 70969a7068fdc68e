/** SHA-256 digests and the canonical JSON they are taken over. */
import { createHash } from 'node:crypto';
import { configure } from 'safe-stable-stringify';

export function sha256Hex(data: string | Uint8Array): string {
  return createHash('sha256').update(data).digest('hex');
}

const sortedStringify = configure({ deterministic: true, circularValue: TypeError });

/**
 * JSON with object keys sorted at every level, so equal values always give equal bytes (and digests)
 * whatever order their keys were built in. Bigints become decimal strings; a circular value throws.
 */
export function canonicalJson(value: object, indent = 0): string {
  return sortedStringify(value, bigintAsString, indent);
}

function bigintAsString(_key: string, value: unknown): string | number | boolean | null | object {
  return typeof value === 'bigint' ? value.toString() : (value as string | number | boolean | null | object);
}
