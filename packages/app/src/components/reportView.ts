/** Rows of the quantisation and NCO reports, computed from the worker's analysis. */
import type { QuantizedFilter } from '@loopwright/dsp';
import type { NcoSummary } from '@loopwright/dsp';
import { fmtEng, fmtFixed, fmtHz, fmtSig } from '../lib/format.ts';


export interface CoefficientRow {
  readonly key: string;
  readonly section: string;
  readonly name: string;
  readonly value: string;
  readonly code: string;
  readonly hex: string;
  readonly quantised: string;
  readonly error: string;
  readonly overflowed: boolean;
}

export interface SectionRow {
  readonly section: string;
  readonly poleRadius: string;
  readonly referencePoleRadius: string;
  readonly stability: string;
  readonly ok: boolean;
}

/** Two's-complement hex of a code in a word of `bits` bits (how the code appears in HDL). */
export function twosComplementHex(code: number, bits: number): string {
  const big = BigInt(code);
  const word = big < 0n ? (1n << BigInt(bits)) + big : big;
  return `0x${word.toString(16).toUpperCase().padStart(Math.ceil(bits / 4), '0')}`;
}

export function qFormatText(q: QuantizedFilter): string {
  const f = q.format;
  return `Q${f.wordBits - f.fractionBits}.${f.fractionBits} (${f.wordBits} bits, LSB ${fmtSig(f.lsb, 4)}, range ${fmtSig(f.minValue, 6)} … ${fmtSig(f.maxValue, 6)})`;
}

export function coefficientRows(q: QuantizedFilter): CoefficientRow[] {
  return q.sections.flatMap((s) =>
    s.coefficients.map((c) => ({
      key: `${s.index}-${c.name}`,
      section: `S${s.index + 1}`,
      name: c.name,
      value: fmtSig(c.value, 10),
      code: String(c.code),
      hex: twosComplementHex(c.code, q.format.wordBits),
      quantised: fmtSig(c.quantizedValue, 10),
      error: (c.quantizedValue - c.value).toExponential(2),
      overflowed: c.overflowed,
    })),
  );
}

const STABILITY_TEXT: Record<string, string> = {
  stable: 'inside unit circle',
  integrator: 'integrator at z = 1 (intended)',
  'on-circle': 'ON the unit circle',
  outside: 'OUTSIDE the unit circle',
};

export function sectionRows(q: QuantizedFilter): SectionRow[] {
  return q.sections.map((s) => ({
    section: `S${s.index + 1}`,
    poleRadius: fmtSig(s.poleRadius, 9),
    referencePoleRadius: fmtSig(s.referencePoleRadius, 9),
    stability: STABILITY_TEXT[s.stability] ?? s.stability,
    ok: s.stability === 'stable' || s.stability === 'integrator',
  }));
}

export function deviationText(q: QuantizedFilter): string {
  if (q.maxDeviationDb === null) return 'quantised response is zero';
  return `${fmtFixed(q.maxDeviationDb, 4, 'dB')} (within ${q.deviationBandDb} dB of the peak)`;
}

export interface NcoRow {
  readonly label: string;
  readonly value: string;
  readonly testId?: string;
}

export function ncoRows(n: NcoSummary): NcoRow[] {
  const t = n.tuning;
  const rows: NcoRow[] = [
    { label: 'Tuning word (decimal)', value: t.tuningWordDecimal, testId: 'nco-tuning-word' },
    { label: 'Tuning word (hex)', value: `0x${BigInt(t.tuningWordDecimal).toString(16).toUpperCase()}` },
    { label: 'Requested frequency', value: fmtHz(t.requestedHz, 10) },
    { label: 'Actual frequency', value: fmtHz(t.actualHz, 12) },
    { label: 'Frequency error', value: `${fmtEng(t.errorHz, 'Hz', 4)} (${fmtSig(t.errorPpm, 4)} ppm)` },
    { label: 'Resolution', value: fmtHz(t.resolutionHz, 5) },
    {
      label: 'Phase-truncation spur',
      value:
        n.spectral.phaseTruncationSpurDbc === null
          ? 'none (no bits truncated)'
          : `${fmtFixed(n.spectral.phaseTruncationSpurDbc, 1, 'dBc')} (worst ${fmtFixed(n.spectral.phaseTruncationSpurWorstDbc, 1, 'dBc')})`,
    },
    { label: 'Amplitude quantisation SNR', value: fmtFixed(n.spectral.amplitudeSnrDb, 1, 'dB') },
  ];
  if (n.control) {
    rows.push(
      { label: 'Control gain code', value: `${n.control.gainCode} >> ${n.control.gainShift}` },
      { label: 'Control scale (ideal / realised)', value: `${fmtSig(n.control.idealScale, 8)} / ${fmtSig(n.control.quantizedScale, 8)}` },
      { label: 'Realised NCO gain', value: fmtEng(n.control.actualGainHzPerUnit, 'Hz/unit', 8) },
    );
  }
  return rows;
}
