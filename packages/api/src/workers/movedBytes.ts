/**
 * Moving a compute thread's bytes to the event loop's thread instead of copying them. Structured clone
 * copies every byte of an answer (a release with 65 536 golden samples is about 6 MB of files, copied
 * once into the message and once out of it); an ArrayBuffer in the transfer list changes hands without
 * a copy and is unusable in the thread that sent it. Only buffers a view owns whole are moved: a small
 * Buffer shares Node's 8 KiB pool with others, which moving would take from under them.
 */
import { move, transferableSymbol, valueSymbol } from 'piscina';

/** The distinct ArrayBuffers the views cover entirely (a transfer list must name each once). */
export function ownedBuffers(views: readonly Uint8Array[]): ArrayBuffer[] {
  const owned = new Set<ArrayBuffer>();
  for (const v of views) {
    if (v.buffer instanceof ArrayBuffer && v.byteOffset === 0 && v.byteLength === v.buffer.byteLength) owned.add(v.buffer);
  }
  return [...owned];
}

/** `value` as a Piscina answer that moves `views`' own buffers with it; the value itself when there are none. */
export function movingBytes<T extends object>(value: T, views: readonly Uint8Array[]): T {
  const transfer = ownedBuffers(views);
  if (transfer.length === 0) return value;
  return move({ [transferableSymbol]: transfer, [valueSymbol]: value }) as unknown as T;
}
