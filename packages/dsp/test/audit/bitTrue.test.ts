/**
 * Golden vectors against an independent Python re-implementation of the README's bit-true arithmetic
 * (steps 1–8, integers exact; reference/audit_reference.py): every column of every sample, given only
 * the input codes, the coefficient codes and the control gain/shift. The tuning word comes from Python's
 * Fraction and the sine table from numpy (round half away from zero of (2^(B−1) − 1)·sin), not from us.
 */
import { describe, expect, it } from 'vitest';
import { exampleSpecs, GOLDEN_VECTOR_SAMPLES, phaseDecimal, planDesign, requireValidSpec, type LoopSpec } from '../../src/index.ts';
import { runAuditReference } from './reference/run.ts';

const base = exampleSpecs.map((e) => e.spec);
const [mains, sp, ll, fm] = base as [LoopSpec, LoopSpec, LoopSpec, LoopSpec];
const specs: LoopSpec[] = [
  ...base,
  { ...mains, name: 'v_trunc_wrap', fixedPoint: { ...mains.fixedPoint, rounding: 'truncate', overflow: 'wrap' } },
  { ...sp, name: 'v_half_even_square', nco: { ...sp.nco, waveform: 'square' }, fixedPoint: { ...sp.fixedPoint, rounding: 'half-even' } },
  { ...ll, name: 'v_acc48', nco: { ...ll.nco, accumulatorBits: 48, phaseBits: 14 } },
  { ...fm, name: 'v_acc64', nco: { ...fm.nco, accumulatorBits: 64 } },
  { ...mains, name: 'v_narrow_mac', fixedPoint: { ...mains.fixedPoint, accumulatorBits: 24, overflow: 'wrap' } },
  { ...mains, name: 'v_narrow_mac_sat', fixedPoint: { ...mains.fixedPoint, dataBits: 12, coefficientBits: 16, accumulatorBits: 20 } },
];

const runs = specs.map((spec) => {
  // The constants and the vectors of one plan: the vectors must be what these constants produce.
  const planned = planDesign(requireValidSpec(spec), { goldenVectors: true });
  return { spec, plan: planned.bitTrue!, v: planned.goldenVectors! };
});
const refs = runAuditReference<{ bitTrue: { rows: (number | string)[][]; tuningWord: string; table: number[]; checksum: number }[] }>({
  bitTrue: runs.map(({ spec, plan, v }) => ({
    dataBits: plan.dataBits, coefficientBits: plan.coefficientBits, fractionBits: plan.coefficientFractionBits, macBits: plan.accumulatorBits,
    ncoAccumulatorBits: plan.ncoAccumulatorBits, phaseBits: plan.phaseBits, amplitudeBits: plan.amplitudeBits,
    rounding: plan.rounding, overflow: plan.overflow, waveform: plan.waveform,
    centerHz: spec.centerHz, sampleRateHz: spec.sampleRateHz,
    gainCode: plan.control.gainCode, gainShift: plan.control.gainShift, coefficientCodes: plan.coefficientCodes,
    inputCode: Array.from(v.record.inputCode),
  })),
}).bitTrue;

describe('golden vectors = README bit-true arithmetic, re-run in Python', () => {
  it.each(runs.map((r, i) => [r.spec.name, i] as const))('%s', (_n, i) => {
    const { plan, v } = runs[i]!;
    const e = refs[i]!;
    expect(plan.tuning.tuningWordDecimal).toBe(e.tuningWord);
    expect(Array.from(plan.sineTable)).toEqual(e.table);
    const rec = v.record;
    let firstBad: string | null = null;
    for (let n = 0; n < rec.length && !firstBad; n++) {
      const row = e.rows[n]!;
      const ours = [rec.inputCode[n], phaseDecimal(rec.phaseHi[n]!, rec.phaseLo[n]!), rec.tableAddress[n], rec.ncoCode[n], rec.detectorCode[n], rec.filterCode[n]];
      const names = ['input_code', 'nco_phase', 'table_address', 'nco_code', 'detector_code', 'filter_code'];
      ours.forEach((x, j) => {
        if (!firstBad && String(x) !== String(row[j])) firstBad = `sample ${n} ${names[j]}: ours ${x}, reference ${row[j]}`;
      });
    }
    expect(firstBad).toBeNull();
    expect(rec.length).toBe(GOLDEN_VECTOR_SAMPLES);
    expect(v.checksum >>> 0).toBe(e.checksum); // FNV-1a as the README defines it
  });
});
