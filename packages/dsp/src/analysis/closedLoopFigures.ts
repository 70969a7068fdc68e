/**
 * Closed-loop −3 dB bandwidth and peaking of H = L/(1 + L) from samples on a log grid.
 * −3 dB means |H| = 1/√2 (−3.0103 dB); the bandwidth is the first frequency above the response peak
 * where |H| falls through it (Og5 Sec. 7-7 (memory): bandwidth of the closed loop). Peaking is the
 * maximum of |H| in dB (0 dB when the response never rises above its DC value of 1, which every loop
 * here has because the NCO integrates).
 */
import { brentRoot, goldenMax } from './roots.ts';
import { type OpenSamples, type ResponseFn, closedDbOfOpen, closedSquaresOfOpen, squareToDb, toDb } from './response.ts';

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
  let i3 = -1;
  for (let i = iPeak; i + 1 < db.length; i++) {
    if (db[i]! >= MINUS_3DB && db[i + 1]! < MINUS_3DB) {
      i3 = i;
      break;
    }
  }
  return figuresAt(h, grid, db.length, iPeak, db[iPeak]!, i3);
}

/**
 * Relative margin by which a square must clear a bound to be decided without its logarithm: 1e-6 is
 * 4.3e-6 dB, while squareToDb is within a few units in the last place of values under 3,000 dB (about
 * 1e-12 dB), so a square decided this way is on the same side as its dB value.
 */
const MARGIN = 1e-6;
/** The square of |H| at −3 dB, the bound MINUS_3DB is the decibels of. */
const HALF_POWER = 0.5;

/**
 * closedLoopFigures of H = L/(1 + L) from the open-loop samples: the same figures as from
 * closedDbOfOpen(open), decided on the squares of |H| (closedSquaresOfOpen) and taking the logarithm
 * only where a comparison is within MARGIN: the largest squares (for the first largest dB value) and
 * squares next to the half-power bound. For a curve that is not shown (600 logarithms fewer).
 */
export function closedLoopFiguresOfOpen(h: ResponseFn, grid: readonly number[], open: OpenSamples, stable = true): ClosedLoopFigures {
  if (!stable) return closedLoopFigures(h, grid, undefined, false);
  const p = closedSquaresOfOpen(open);
  if (!p) return closedLoopFigures(h, grid, closedDbOfOpen(open), true);
  const n = p.length;
  let pMax = p[0]!;
  for (let i = 1; i < n; i++) if (p[i]! > pMax) pMax = p[i]!;
  const near = pMax * (1 - MARGIN);
  let iPeak = -1;
  let peakDb = -Infinity;
  for (let i = 0; i < n; i++) {
    if (!(p[i]! >= near)) continue;
    const d = squareToDb(p[i]!);
    if (d > peakDb) {
      peakDb = d;
      iPeak = i;
    }
  }
  let i3 = -1;
  let above = atOrAboveHalfPower(p[iPeak]!);
  for (let i = iPeak; i + 1 < n; i++) {
    const next = atOrAboveHalfPower(p[i + 1]!);
    if (above && !next) {
      i3 = i;
      break;
    }
    above = next;
  }
  return figuresAt(h, grid, n, iPeak, peakDb, i3);
}

/** squareToDb(p) >= MINUS_3DB, from p itself unless p is within MARGIN of the bound. */
function atOrAboveHalfPower(p: number): boolean {
  if (p > HALF_POWER * (1 + MARGIN)) return true;
  if (p < HALF_POWER * (1 - MARGIN)) return false;
  return squareToDb(p) >= MINUS_3DB;
}

/**
 * The figures from the grid index of the first largest sample (its dB value peakDb) and the index i3
 * after which |H| first falls through −3 dB at or above the peak (−1 if it never does): the peak
 * refined by a golden-section search, the bandwidth by Brent's method, both in log-frequency.
 */
function figuresAt(h: ResponseFn, grid: readonly number[], n: number, iPeak: number, peakDb: number, i3: number): ClosedLoopFigures {
  let peakingDb = Math.max(0, peakDb);
  let peakHz: number | null = null;
  if (peakDb > 0 && iPeak > 0 && iPeak < n - 1) {
    const [x, v] = goldenMax((lx) => toDb(h(Math.exp(lx))), Math.log(grid[iPeak - 1]!), Math.log(grid[iPeak + 1]!));
    peakingDb = Math.max(peakingDb, v);
    peakHz = Math.exp(x);
  } else if (peakDb > 0) {
    peakHz = grid[iPeak]!;
  }
  const notes: string[] = [];
  let bandwidth3dbHz: number | null = null;
  if (i3 >= 0) {
    const x = brentRoot((lx) => toDb(h(Math.exp(lx))) - MINUS_3DB, Math.log(grid[i3]!), Math.log(grid[i3 + 1]!), 1e-13);
    bandwidth3dbHz = Math.exp(x);
  }
  if (bandwidth3dbHz === null) notes.push(`|H| stays above −3 dB up to ${grid[grid.length - 1]!.toPrecision(6)} Hz`);
  return { bandwidth3dbHz, peakingDb, peakHz, notes };
}
