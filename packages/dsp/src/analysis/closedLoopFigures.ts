/**
 * Closed-loop −3 dB bandwidth and peaking of H = L/(1 + L) from samples on a log grid.
 * −3 dB means |H| = 1/√2 (−3.0103 dB); the bandwidth is the first frequency above the response peak
 * where |H| falls through it (Og5 Sec. 7-7 (memory): bandwidth of the closed loop). Peaking is the
 * maximum of |H| in dB (0 dB when the response never rises above its DC value of 1, which every loop
 * here has because the NCO integrates).
 */
import { brentRoot, goldenMax } from './roots.ts';
import { type ResponseFn, toDb } from './response.ts';

export interface ClosedLoopFigures {
  readonly bandwidth3dbHz: number | null;
  /** null when the closed loop is unstable (no frequency response exists). */
  readonly peakingDb: number | null;
  readonly peakHz: number | null;
  readonly notes: readonly string[];
}

export const MINUS_3DB = 10 * Math.log10(0.5);

/**
 * Figures of the closed loop h on the grid; `samplesDb` may give |h| in dB on the grid already (from the
 * open-loop samples, H = L/(1 + L), which the Bode plot shows too) to save the evaluations. An unstable
 * closed loop (`stable` false) has none.
 */
export const UNSTABLE_NOTE =
  'the closed loop is unstable: |H| on the frequency axis is not a frequency response (there is no steady state), so its bandwidth, peaking and noise bandwidth do not exist';

export function closedLoopFigures(
  h: ResponseFn,
  grid: readonly number[],
  samplesDb?: readonly number[],
  stable = true,
): ClosedLoopFigures {
  if (!stable) return { bandwidth3dbHz: null, peakingDb: null, peakHz: null, notes: [UNSTABLE_NOTE] };
  const db = samplesDb ?? grid.map((f) => toDb(h(f)));
  let iPeak = 0;
  for (let i = 1; i < db.length; i++) if (db[i]! > db[iPeak]!) iPeak = i;
  let peakingDb = Math.max(0, db[iPeak]!);
  let peakHz: number | null = null;
  if (db[iPeak]! > 0 && iPeak > 0 && iPeak < db.length - 1) {
    const [x, v] = goldenMax((lx) => toDb(h(Math.exp(lx))), Math.log(grid[iPeak - 1]!), Math.log(grid[iPeak + 1]!));
    peakingDb = Math.max(peakingDb, v);
    peakHz = Math.exp(x);
  } else if (db[iPeak]! > 0) {
    peakHz = grid[iPeak]!;
  }
  const notes: string[] = [];
  let bandwidth3dbHz: number | null = null;
  for (let i = iPeak; i + 1 < db.length; i++) {
    if (db[i]! >= MINUS_3DB && db[i + 1]! < MINUS_3DB) {
      const x = brentRoot((lx) => toDb(h(Math.exp(lx))) - MINUS_3DB, Math.log(grid[i]!), Math.log(grid[i + 1]!), 1e-13);
      bandwidth3dbHz = Math.exp(x);
      break;
    }
  }
  if (bandwidth3dbHz === null) notes.push(`|H| stays above −3 dB up to ${grid[grid.length - 1]!.toPrecision(6)} Hz`);
  return { bandwidth3dbHz, peakingDb, peakHz, notes };
}
