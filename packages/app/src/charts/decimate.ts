/**
 * Min/max decimation for long time traces: each bucket keeps its smallest and largest sample in
 * their original order, so peaks and glitches survive at any zoom (common practice, no source).
 */
export function decimateMinMax(x: ArrayLike<number>, y: ArrayLike<number>, maxPoints: number): [number, number][] {
  const n = Math.min(x.length, y.length);
  const out: [number, number][] = [];
  if (n <= maxPoints) {
    for (let i = 0; i < n; i++) out.push([x[i] as number, y[i] as number]);
    return out;
  }
  const buckets = Math.max(1, Math.floor(maxPoints / 2));
  const size = n / buckets;
  for (let b = 0; b < buckets; b++) {
    const start = Math.floor(b * size);
    const end = Math.min(n, Math.floor((b + 1) * size));
    if (end <= start) continue;
    let lo = start;
    let hi = start;
    for (let i = start + 1; i < end; i++) {
      if ((y[i] as number) < (y[lo] as number)) lo = i;
      if ((y[i] as number) > (y[hi] as number)) hi = i;
    }
    const first = Math.min(lo, hi);
    const second = Math.max(lo, hi);
    out.push([x[first] as number, y[first] as number]);
    if (second !== first) out.push([x[second] as number, y[second] as number]);
  }
  return out;
}
