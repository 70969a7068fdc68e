/**
 * The float loop (DESIGN.md conventions), double precision, the same structure as the bit-true loop:
 * NCO output cos(2π·φo) (or its sign, square), detector u = x·nco, loop filter F(z) as direct-form-I
 * sections, NCO phase φo[n+1] = φo[n] + (centerHz + gainHzPerUnit·y[n])/fs cycles — one sample of
 * delay, Ko·T·z⁻¹/(1 − z⁻¹).
 */
import type { Sos } from '../types/filter.ts';

export interface FloatLoopConfig {
  readonly sampleRateHz: number;
  readonly centerHz: number;
  readonly gainHzPerUnit: number;
  readonly waveform: 'sine' | 'square';
  readonly sections: readonly Sos[];
}

export interface FloatState {
  /** NCO phase in cycles, [0, 1). */
  phaseCycles: number;
  /** Per section: x[n−1], x[n−2], y[n−1], y[n−2]. */
  readonly sections: Float64Array;
  readonly coef: Float64Array;
}

export interface FloatChunkOut {
  /** NCO phase at each sample (cycles, before it advances). */
  readonly ncoPhaseCycles: Float64Array;
  readonly filterOutput: Float64Array;
}

export function initialFloatState(cfg: FloatLoopConfig): FloatState {
  return {
    phaseCycles: 0,
    sections: new Float64Array(4 * cfg.sections.length),
    coef: Float64Array.from(cfg.sections.flatMap((s) => [s.b[0], s.b[1], s.b[2], s.a[1], s.a[2]])),
  };
}

export function runFloatChunk(cfg: FloatLoopConfig, st: FloatState, x: Float64Array, count: number, out: FloatChunkOut): void {
  const ns = cfg.sections.length;
  const coef = st.coef;
  const s = st.sections;
  const base = cfg.centerHz / cfg.sampleRateHz;
  const gain = cfg.gainHzPerUnit / cfg.sampleRateHz;
  const square = cfg.waveform === 'square';
  let ph = st.phaseCycles;
  for (let i = 0; i < count; i++) {
    const c = Math.cos(2 * Math.PI * ph);
    const nco = square ? (c >= 0 ? 1 : -1) : c;
    let v = (x[i] as number) * nco;
    for (let j = 0; j < ns; j++) {
      const o = 5 * j;
      const q = 4 * j;
      const x1 = s[q] as number;
      const y1 = s[q + 2] as number;
      const y =
        (coef[o] as number) * v + (coef[o + 1] as number) * x1 + (coef[o + 2] as number) * (s[q + 1] as number) -
        (coef[o + 3] as number) * y1 - (coef[o + 4] as number) * (s[q + 3] as number);
      s[q + 1] = x1;
      s[q] = v;
      s[q + 3] = y1;
      s[q + 2] = y;
      v = y;
    }
    out.ncoPhaseCycles[i] = ph;
    out.filterOutput[i] = v;
    ph += base + gain * v;
    ph -= Math.floor(ph);
  }
  st.phaseCycles = ph;
}
