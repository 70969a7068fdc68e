/**
 * JSON answers whose text is made off the event loop. A simulation's traces are about half a megabyte
 * of JSON, and JSON.stringify of that takes 10-40 ms of a core: done on the event loop, every other
 * request waits that long. The compute thread encodes the result instead (encodeJson), the service
 * wraps it with the answer's other members (encodedObject) and routes/table.ts sends the bytes as they
 * are, the same bytes res.json would have sent.
 */

/** An answer already encoded as UTF-8 JSON; `T` is only what the text decodes to. */
export class EncodedJson<T> {
  declare readonly decodesTo: T;
  constructor(readonly bytes: Buffer) {}
}

const utf8 = new TextEncoder();

/**
 * UTF-8 JSON of a value, exactly as JSON.stringify (and so res.json) writes it. TextEncoder gives the
 * bytes an ArrayBuffer of their own (a small Buffer shares Node's pool), so posting them to another
 * thread copies only them.
 */
export function encodeJson(value: unknown): Uint8Array {
  return utf8.encode(JSON.stringify(value));
}

/** Wraps bytes from encodeJson, e.g. as they arrive from a compute thread, without copying them. */
export function encodedJsonOf<T>(bytes: Uint8Array): EncodedJson<T> {
  return new EncodedJson<T>(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength));
}

/**
 * The JSON object of these members in their order, each a plain value or already encoded: byte for
 * byte what JSON.stringify makes of the same object with the decoded values (undefined members are
 * left out, as JSON.stringify leaves them out).
 */
export function encodedObject<T>(members: Readonly<Record<string, unknown>>): EncodedJson<T> {
  const parts: Buffer[] = [];
  for (const [key, value] of Object.entries(members)) {
    if (value === undefined) continue;
    parts.push(Buffer.from(`${parts.length === 0 ? '{' : ','}${JSON.stringify(key)}:`));
    parts.push(value instanceof EncodedJson ? value.bytes : Buffer.from(JSON.stringify(value)));
  }
  parts.push(Buffer.from(parts.length === 0 ? '{}' : '}'));
  return new EncodedJson<T>(Buffer.concat(parts));
}
