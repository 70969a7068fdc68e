/**
 * Builds the language-neutral constants (./handoff.ts) from the server's plan of the design: every
 * width, code and table is the bit-true loop's (planDesign's `bitTrue`, the constants the golden
 * vectors were run with), named as docs/DESIGN.md "One name per concept" lists them.
 * Only numbers and fixed wording enter; the design name is the sole identifier source.
 */
import type { LoopSpec } from '@loopwright/dsp';
import type { ReleasablePlan } from './compute.ts';
import type { CodeConstant, CountConstant, HandoffModel, TableConstant, WordType } from './handoff.ts';
import { codeRange, toCode } from './literals.ts';

/** What the constants are made of: the plan's spec (name, rates), its quantised sections and its bit-true constants. */
export type HandoffInput = Pick<ReleasablePlan, 'spec' | 'quantized' | 'bitTrue'>;

const COEFFICIENT_NAMES = ['b0', 'b1', 'b2', 'a1', 'a2'] as const;
const ROUNDING_CODES: Readonly<Record<LoopSpec['fixedPoint']['rounding'], number>> = { truncate: 0, nearest: 1, 'half-even': 2 };

export function handoffModel({ spec, quantized, bitTrue: plan }: HandoffInput): HandoffModel {
  const { tuning, control } = plan;
  const qText = `Q${plan.coefficientBits - plan.coefficientFractionBits}.${plan.coefficientFractionBits} (${plan.coefficientBits} bits, ${plan.coefficientFractionBits} fraction bits)`;
  const counts: CountConstant[] = [
    { suffix: 'DATA_BITS', value: plan.dataBits, meaning: 'width of detector and filter data words, signed' },
    { suffix: 'COEF_BITS', value: plan.coefficientBits, meaning: 'width of filter coefficient words, signed' },
    { suffix: 'COEF_FRACTION_BITS', value: plan.coefficientFractionBits, meaning: `fraction bits of every coefficient: ${qText}` },
    { suffix: 'ACC_BITS', value: plan.accumulatorBits, meaning: 'width of the filter accumulator, signed' },
    { suffix: 'SECTION_COUNT', value: plan.sectionCount, meaning: 'second-order sections of the loop filter, in cascade order' },
    { suffix: 'NCO_ACC_BITS', value: plan.ncoAccumulatorBits, meaning: 'width of the NCO phase accumulator, unsigned' },
    { suffix: 'NCO_PHASE_BITS', value: plan.phaseBits, meaning: 'sine table address bits: the top bits of the phase accumulator' },
    { suffix: 'NCO_AMPLITUDE_BITS', value: plan.amplitudeBits, meaning: 'width of NCO output samples, signed' },
    { suffix: 'NCO_FULL_SCALE', value: plan.ncoFullScale, meaning: 'NCO peak code 2^(B-1) - 1: the sine table is symmetric' },
    { suffix: 'SINE_LENGTH', value: plan.sineTable.length, meaning: 'entries of the sine table, 2^NCO_PHASE_BITS' },
    {
      suffix: 'NCO_GAIN_SHIFT',
      value: control.gainShift,
      meaning: 'tuning increment = round(filter output times NCO_GAIN_CODE / 2^NCO_GAIN_SHIFT); negative means a left shift',
    },
  ];
  // Modes as numbers, so firmware can switch on them (the arithmetic itself: README.txt).
  counts.push(
    { suffix: 'ROUNDING', value: ROUNDING_CODES[plan.rounding], meaning: `rounding mode ${plan.rounding}: 0 = truncate (toward minus infinity), 1 = nearest (half away from zero), 2 = half-even` },
    { suffix: 'OVERFLOW_SATURATE', value: plan.overflow === 'saturate' ? 1 : 0, meaning: `overflow mode ${plan.overflow}: 1 = saturate, 0 = wrap` },
    { suffix: 'NCO_SQUARE', value: plan.waveform === 'square' ? 1 : 0, meaning: `NCO waveform ${plan.waveform}: 0 = sine table, 1 = square (plus or minus NCO_FULL_SCALE)` },
  );
  const clocksPerSample = spec.clockHz / spec.sampleRateHz;
  if (Number.isSafeInteger(clocksPerSample)) {
    counts.push({ suffix: 'CLOCKS_PER_SAMPLE', value: clocksPerSample, meaning: `fabric clock cycles per loop update (${spec.clockHz} Hz / ${spec.sampleRateHz} Hz)` });
  }

  const codes: CodeConstant[] = [
    {
      suffix: 'NCO_TUNING_WORD',
      signedness: 'unsigned',
      widthBits: plan.ncoAccumulatorBits,
      // The exact word as the hardware holds it: two 32-bit halves, joined without a decimal detour.
      code: (BigInt(tuning.tuningWordHi) << 32n) | BigInt(tuning.tuningWordLo),
      meaning: `phase increment per loop update for centerHz ${spec.centerHz} Hz at ${spec.sampleRateHz} Hz (actual ${tuning.actualHz} Hz)`,
    },
    {
      suffix: 'NCO_GAIN_CODE',
      signedness: 'signed',
      widthBits: plan.coefficientBits,
      code: toCode(control.gainCode),
      meaning: `accumulator LSBs per filter-output LSB, times 2^NCO_GAIN_SHIFT (scale ${control.quantizedScale}, ideal ${control.idealScale})`,
    },
  ];
  for (const section of quantized.sections) {
    for (const name of COEFFICIENT_NAMES) {
      const c = section.coefficients.find((x) => x.name === name);
      codes.push({
        suffix: `S${section.index}_${name.toUpperCase()}`,
        signedness: 'signed',
        widthBits: plan.coefficientBits,
        code: toCode(section.codes[name]),
        meaning: `section ${section.index} ${name}, ${qText}, value ${c ? String(Number(c.quantizedValue.toPrecision(12))) : "n/a"}`,
      });
    }
  }
  codes.push(...limits('DATA', plan.dataBits, 'data word'), ...limits('ACC', plan.accumulatorBits, 'filter accumulator'));

  const types: WordType[] = [
    { suffix: 'coef', signedness: 'signed', widthBits: plan.coefficientBits, meaning: `filter coefficient, ${qText}` },
    { suffix: 'data', signedness: 'signed', widthBits: plan.dataBits, meaning: 'detector and filter data word' },
    { suffix: 'acc', signedness: 'signed', widthBits: plan.accumulatorBits, meaning: 'filter accumulator' },
    { suffix: 'phase', signedness: 'unsigned', widthBits: plan.ncoAccumulatorBits, meaning: 'NCO phase accumulator' },
  ];
  const tables: TableConstant[] = [
    {
      suffix: 'SINE',
      signedness: 'signed',
      widthBits: plan.amplitudeBits,
      codes: Array.from(plan.sineTable),
      meaning: `sine table: entry k = round((2^(B-1) - 1) sin(2 pi k / 2^P)), B = ${plan.amplitudeBits}, P = ${plan.phaseBits}; address (phase >> (N - P)) + 2^(P-2) mod 2^P gives cos`,
    },
  ];
  return { name: spec.name, counts, codes, types, tables };
}

function limits(prefix: string, widthBits: number, what: string): CodeConstant[] {
  const { min, max } = codeRange('signed', widthBits);
  return [
    { suffix: `${prefix}_MAX`, signedness: 'signed', widthBits, code: max, meaning: `largest ${what} code, saturation limit` },
    { suffix: `${prefix}_MIN`, signedness: 'signed', widthBits, code: min, meaning: `smallest ${what} code, saturation limit` },
  ];
}
