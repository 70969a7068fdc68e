/**
 * The buffers a worker's answer may move to the page instead of copying: structured clone copies
 * every typed array (a simulation's traces, its full per-sample traces up to FULL_TRACE_LIMIT
 * samples, the plan's sine table), a transferred ArrayBuffer changes hands as it is. Only a buffer
 * a view covers whole is moved, each once; a view of part of a buffer is copied with the rest.
 */
export function movableBuffers(value: unknown): ArrayBuffer[] {
  const found = new Set<ArrayBuffer>();
  const seen = new Set<object>();
  const visit = (v: unknown): void => {
    if (typeof v !== 'object' || v === null || seen.has(v)) return;
    seen.add(v);
    if (ArrayBuffer.isView(v)) {
      if (v.buffer instanceof ArrayBuffer && v.byteOffset === 0 && v.byteLength === v.buffer.byteLength) found.add(v.buffer);
      return;
    }
    for (const member of Array.isArray(v) ? v : Object.values(v)) visit(member);
  };
  visit(value);
  return [...found];
}
