/**
 * JSON answers whose text is made off the event loop. A simulation's traces are about half a megabyte
 * of JSON, and JSON.stringify of that takes 10-40 ms of a core: done on the event loop, every other
 * request waits that long. The compute thread encodes the result instead (encodeJson), the service
 * wraps it with the answer's other members (encodedObject) and routes/table.ts sends the bytes as they
 * are, with res.json's header: JSON.stringify's text, typed arrays written as JSON arrays (jsonText).
 */

/** An answer already encoded as UTF-8 JSON; `T` is only what the text decodes to. */
export class EncodedJson<T> {
  declare readonly decodesTo: T;
  constructor(readonly bytes: Buffer) {}
}

const utf8 = new TextEncoder();

/**
 * JSON text of a value as JSON.stringify writes it, except that each typed array (a simulation's
 * traces, the bit-true plan's sine table) is written as a JSON array of its numbers. JSON.stringify
 * treats a typed array as an ordinary object and writes {"0":…,"1":…} (ECMA262, JSON.stringify:
 * SerializeJSONObject over its own enumerable keys), which a client reads as a map, not a list.
 */
export function jsonText(value: unknown): string {
  return JSON.stringify(withPlainArrays(value));
}

/**
 * The value with every typed array replaced by a plain array of the same numbers; objects and arrays
 * on the way are copied (own enumerable keys in their order, as JSON.stringify reads them), the rest
 * kept as it is, an object with toJSON (a Date) included, so JSON.stringify still calls it. A typed
 * array becomes a plain one before it is written, so JSON.stringify keeps its fast path for it.
 */
function withPlainArrays(value: unknown): unknown {
  if (typeof value !== 'object' || value === null) return value;
  if (ArrayBuffer.isView(value)) return value instanceof DataView ? value : Array.from(value as unknown as ArrayLike<number>);
  if (Array.isArray(value)) return value.map(withPlainArrays);
  if (typeof (value as { toJSON?: unknown }).toJSON === 'function') return value;
  const out: Record<string, unknown> = {};
  for (const key of Object.keys(value)) out[key] = withPlainArrays((value as Record<string, unknown>)[key]);
  return out;
}

/**
 * UTF-8 JSON of a value (jsonText). TextEncoder gives the bytes an ArrayBuffer of their own (a small
 * Buffer shares Node's pool), so posting them to another thread copies only them.
 */
export function encodeJson(value: unknown): Uint8Array {
  return utf8.encode(jsonText(value));
}

/** Wraps bytes from encodeJson, e.g. as they arrive from a compute thread, without copying them. */
export function encodedJsonOf<T>(bytes: Uint8Array): EncodedJson<T> {
  return new EncodedJson<T>(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength));
}

/**
 * The JSON object of these members in their order, each a plain value or already encoded: byte for
 * byte what jsonText makes of the same object with the decoded values (undefined members are left
 * out, as JSON.stringify leaves them out).
 */
export function encodedObject<T>(members: Readonly<Record<string, unknown>>): EncodedJson<T> {
  const parts: Buffer[] = [];
  for (const [key, value] of Object.entries(members)) {
    if (value === undefined) continue;
    parts.push(Buffer.from(`${parts.length === 0 ? '{' : ','}${JSON.stringify(key)}:`));
    parts.push(value instanceof EncodedJson ? value.bytes : Buffer.from(jsonText(value)));
  }
  parts.push(Buffer.from(parts.length === 0 ? '{}' : '}'));
  return new EncodedJson<T>(Buffer.concat(parts));
}
