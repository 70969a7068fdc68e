/**
 * Which points of a plotted line can be left out without the line moving on screen. ECharts lays
 * out, builds and strokes every point it is given on every redraw, and most of the Bode plot's 600
 * points a trace lie on stretches that are straight on its log-frequency axis (−20 or −40 dB a
 * decade, flat phase): drawing only the points that bend the line keeps the same picture for a
 * fraction of the work.
 *
 * Douglas–Peucker (DP73): keep both ends; between two kept points keep the one farthest from the
 * chord joining them, and split there, until no point of a stretch is farther than the tolerance.
 * The distance is measured vertically (in the y unit), which a zoom of the frequency axis leaves
 * unchanged, so the bound holds at any zoom. Kept points are points of the input, never moved.
 */

/**
 * Indices of the points to draw, in order: every point left out lies within `toleranceY` (vertically)
 * of the straight segment between the kept points on either side of it. `x` is where the points
 * are on the plot's own axis (log10 of the frequency on a log axis), increasing.
 */
export function keptIndices(x: ArrayLike<number>, y: ArrayLike<number>, toleranceY: number): number[] {
  const n = Math.min(x.length, y.length);
  if (n <= 2) return Array.from({ length: n }, (_, i) => i);
  const keep = new Uint8Array(n);
  keep[0] = 1;
  keep[n - 1] = 1;
  const stack: number[] = [0, n - 1];
  while (stack.length > 0) {
    const last = stack.pop() as number;
    const first = stack.pop() as number;
    const x0 = x[first] as number;
    const y0 = y[first] as number;
    const slope = ((y[last] as number) - y0) / ((x[last] as number) - x0);
    let farthest = -1;
    let farthestBy = toleranceY;
    for (let i = first + 1; i < last; i++) {
      const off = Math.abs(y0 + slope * ((x[i] as number) - x0) - (y[i] as number));
      if (off > farthestBy) {
        farthestBy = off;
        farthest = i;
      }
    }
    if (farthest < 0) continue;
    keep[farthest] = 1;
    if (farthest - first > 1) stack.push(first, farthest);
    if (last - farthest > 1) stack.push(farthest, last);
  }
  const out: number[] = [];
  for (let i = 0; i < n; i++) if (keep[i]) out.push(i);
  return out;
}
