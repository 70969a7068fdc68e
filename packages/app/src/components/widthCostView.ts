/**
 * The word-length search's cost column: each candidate width as the spec it would make, and a table
 * row of its error figures beside the yosys estimate of its reference RTL (or why there is none).
 */
import type { LoopSpec, WordLengthResult } from '@loopwright/dsp';
import type { CandidateEstimate } from '../api/types.ts';

export interface WidthCandidate {
  readonly kind: 'coefficients' | 'data';
  readonly bits: number;
  readonly spec: LoopSpec;
  readonly passes: boolean;
  /** The error figure the search judged it by, in words. */
  readonly error: string;
}

const fmt = (v: number | null, digits: number, unit: string) => (v === null ? '—' : `${v.toFixed(digits)} ${unit}`);

/**
 * Widths worth a synthesis (each takes yosys tens of seconds): around the cheapest passing width, one
 * below it and four above, and the spec's own; with no passing width, the three widest tried.
 */
export function costedWidths(widths: readonly number[], minBits: number | null, own: number): Set<number> {
  const near = minBits === null ? [...widths].sort((a, b) => b - a).slice(0, 3) : widths.filter((w) => w >= minBits - 1 && w <= minBits + 4);
  return new Set([...near, ...widths.filter((w) => w === own)]);
}

/** The spec each costed curve point stands for: the searched spec with that width (and the MAC word the search used). */
export function widthCandidates(r: WordLengthResult, spec: LoopSpec): WidthCandidate[] {
  const fp = spec.fixedPoint;
  const coefWidths = costedWidths(r.coefficients.curve.map((p) => p.coefficientBits), r.coefficients.minBits, fp.coefficientBits);
  const dataWidths = costedWidths((r.data?.curve ?? []).map((p) => p.dataBits), r.data?.minBits ?? null, fp.dataBits);
  const coefficients = r.coefficients.curve.filter((p) => coefWidths.has(p.coefficientBits)).map((p): WidthCandidate => ({
    kind: 'coefficients',
    bits: p.coefficientBits,
    passes: p.passes,
    error: p.stable ? `PM error ${fmt(p.phaseMarginErrorDeg, 2, '°')}, response ${fmt(p.maxDeviationDb, 3, 'dB')}` : `unstable: no margin; response ${fmt(p.maxDeviationDb, 3, 'dB')}`,
    spec: {
      ...spec,
      fixedPoint: { ...fp, coefficientBits: p.coefficientBits, coefficientFractionBits: p.fractionBits ?? 'auto', accumulatorBits: Math.max(fp.accumulatorBits, p.coefficientBits) },
    },
  }));
  const data = (r.data?.curve ?? []).filter((p) => dataWidths.has(p.dataBits)).map((p): WidthCandidate => ({
    kind: 'data',
    bits: p.dataBits,
    passes: p.passes,
    error: `phase error ${p.steadyStatePhaseErrorDeg.toFixed(3)}°, jitter ${p.phaseJitterDeg.toFixed(3)}°`,
    spec: { ...spec, fixedPoint: { ...fp, dataBits: p.dataBits, accumulatorBits: p.accumulatorBits } },
  }));
  return [...coefficients, ...data];
}

export interface WidthCostRow {
  readonly key: string;
  readonly width: string;
  readonly passes: string;
  readonly error: string;
  readonly luts: string;
  readonly flipFlops: string;
  readonly multipliers: string;
  readonly ice40Dsp: string;
  readonly note: string;
}

export function widthCostRows(candidates: readonly WidthCandidate[], costs: readonly (CandidateEstimate | undefined)[]): WidthCostRow[] {
  return candidates.map((c, i) => {
    const e = costs[i];
    const width = c.kind === 'coefficients' ? `coefficients ${c.bits} bits` : `data ${c.bits} bits (MAC ${c.spec.fixedPoint.accumulatorBits})`;
    const base = { key: `${c.kind}-${c.bits}`, width, passes: c.passes ? 'yes' : 'no', error: c.error };
    if (e?.state === 'estimated') {
      const g = e.total.generic;
      return { ...base, luts: String(g.luts), flipFlops: String(g.flipFlops), multipliers: String(g.multipliers), ice40Dsp: String(e.total.ice40.dspBlocks), note: '' };
    }
    const note = e === undefined || e.state === 'pending' ? 'estimating…' : e.state === 'invalid' ? `cannot build: ${e.message}` : `not estimated: ${e.reason}`;
    return { ...base, luts: '—', flipFlops: '—', multipliers: '—', ice40Dsp: '—', note };
  });
}
