/** Frequency grids for Bode data and crossing searches. */

/** `points` log-spaced frequencies from fMinHz to fMaxHz, both included exactly. */
export function logGrid(fMinHz: number, fMaxHz: number, points: number): number[] {
  const out = new Array<number>(points);
  const l0 = Math.log(fMinHz);
  const step = (Math.log(fMaxHz) - l0) / (points - 1);
  for (let i = 0; i < points; i++) out[i] = Math.exp(l0 + i * step);
  out[0] = fMinHz;
  out[points - 1] = fMaxHz;
  return out;
}
