/**
 * Where a sweep loses lock going out and regains it coming back (the hysteresis between hold-in and
 * lock-in / pull-in, G3 Ch. 2). Definitions (README "Sweep"): the multiplier detector u = Kd·sin θe
 * (G3 Ch. 2) has its stable equilibria within ±π/2 of 2πk and its unstable ones at odd multiples of π,
 * so a cycle slips each time the ripple-free phase error crosses an odd multiple of π (its cycle index
 * round(θe/2π) changes). Lock is lost going out where the error last left the stable half-cycle
 * |θe − 2πk| < π/2 before the first slip of the way out; it is regained where the error first re-entered
 * that half-cycle after the run's last slip, provided the run ends locked. Between the loss and the slip
 * the ramp moves on, so the slip itself would place the loss too far out.
 */
import type { SweepMetrics } from '../types/sim.ts';

const TWO_PI = 2 * Math.PI;
const HALF_PI = Math.PI / 2;

interface Moment {
  readonly sample: number;
  readonly offsetHz: number;
}

export class SweepTracker {
  private cycle: number | null = null;
  /** The last sample inside the stable half-cycle (a loss starts after it). */
  private lastInside: Moment | null = null;
  /** The first sample back inside the stable half-cycle after the latest slip. */
  private reentered: Moment | null = null;
  private lost: Moment | null = null;
  private slips = 0;
  private slipsOut = 0;
  private slipsBack = 0;

  /** `turnSample`: the first sample of the way back. */
  constructor(
    private readonly turnSample: number,
    private readonly sampleRateHz: number,
  ) {}

  /** Samples n0 … n0 + count − 1: the unwrapped phase error with the ripple removed, and the input offset. */
  push(n0: number, count: number, smoothRad: Float64Array, offsetHz: Float64Array): void {
    for (let i = 0; i < count; i++) {
      const e = smoothRad[i] as number;
      const k = Math.round(e / TWO_PI);
      const n = n0 + i;
      if (this.cycle === null) this.cycle = k;
      if (k !== this.cycle) {
        const slipped = Math.abs(k - this.cycle);
        this.cycle = k;
        this.slips += slipped;
        if (n < this.turnSample) {
          this.slipsOut += slipped;
          this.lost ??= this.lastInside ?? { sample: n, offsetHz: offsetHz[i] as number };
        } else this.slipsBack += slipped;
        this.reentered = null;
      }
      if (Math.abs(e - TWO_PI * k) < HALF_PI) {
        const m = { sample: n, offsetHz: offsetHz[i] as number };
        this.lastInside = m;
        if (this.slips > 0) this.reentered ??= m;
      }
    }
  }

  /** `lockedAtEnd`: the run's own lock verdict (metrics.locked). */
  result(lockedAtEnd: boolean): SweepMetrics {
    const s = (m: Moment | null) => (m === null ? null : m.sample / this.sampleRateHz);
    const regained = this.lost !== null && lockedAtEnd ? this.reentered : null;
    return {
      turnS: this.turnSample / this.sampleRateHz,
      lockLostHz: this.lost?.offsetHz ?? null,
      lockLostS: s(this.lost),
      lockRegainedHz: regained?.offsetHz ?? null,
      lockRegainedS: s(regained),
      slipsOut: this.slipsOut,
      slipsBack: this.slipsBack,
      heldThroughout: this.slips === 0,
    };
  }
}
