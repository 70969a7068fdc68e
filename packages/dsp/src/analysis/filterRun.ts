/** Direct-form II transposed recursion of a b/a filter on an input generator (OS3 Sec. 6.3 (memory)). */
import type { DigitalTf } from '../types/filter.ts';

/** Run y = (b/a)·x for n samples of x(i); a[0] = 1. Returns every `stride`-th output starting at 0. */
export function runFilter(tf: DigitalTf, n: number, x: (i: number) => number, stride = 1): number[] {
  const order = Math.max(tf.a.length, tf.b.length) - 1;
  const b = Array.from({ length: order + 1 }, (_, i) => tf.b[i] ?? 0);
  const a = Array.from({ length: order + 1 }, (_, i) => tf.a[i] ?? 0);
  const z = new Float64Array(order + 1);
  const out: number[] = [];
  for (let i = 0; i < n; i++) {
    const xi = x(i);
    const y = b[0]! * xi + z[0]!;
    for (let k = 1; k <= order; k++) z[k - 1] = b[k]! * xi + z[k]! - a[k]! * y;
    if (i % stride === 0) out.push(y);
  }
  return out;
}
