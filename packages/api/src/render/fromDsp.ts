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
  const qFormat = `Q${plan.coefficientBits - plan.coefficientFractionBits}.${plan.coefficientFractionBits}`;
  const qText = `${qFormat} (${plan.coefficientBits} bits, ${plan.coefficientFractionBits} fraction bits)`;
  const counts: CountConstant[] = [
    { suffix: 'DATA_BITS', value: plan.dataBits, label: 'Data word width', unit: 'bits', meaning: 'width of detector and filter data words, signed' },
    { suffix: 'COEF_BITS', value: plan.coefficientBits, label: 'Coefficient word width', unit: 'bits', meaning: 'width of filter coefficient words, signed' },
    { suffix: 'COEF_FRACTION_BITS', value: plan.coefficientFractionBits, label: 'Coefficient fraction bits', unit: 'bits', meaning: `fraction bits of every coefficient: ${qText}` },
    { suffix: 'ACC_BITS', value: plan.accumulatorBits, label: 'Filter accumulator width', unit: 'bits', meaning: 'width of the filter accumulator, signed' },
    { suffix: 'SECTION_COUNT', value: plan.sectionCount, label: 'Filter sections', unit: 'sections', meaning: 'second-order sections of the loop filter, in cascade order' },
    { suffix: 'NCO_ACC_BITS', value: plan.ncoAccumulatorBits, label: 'NCO phase accumulator width', unit: 'bits', meaning: 'width of the NCO phase accumulator, unsigned' },
    { suffix: 'NCO_PHASE_BITS', value: plan.phaseBits, label: 'Sine table address width', unit: 'bits', meaning: 'sine table address bits: the top bits of the phase accumulator' },
    { suffix: 'NCO_AMPLITUDE_BITS', value: plan.amplitudeBits, label: 'NCO output width', unit: 'bits', meaning: 'width of NCO output samples, signed' },
    { suffix: 'NCO_FULL_SCALE', value: plan.ncoFullScale, label: 'NCO peak code', unit: '', meaning: 'NCO peak code 2^(B-1) - 1: the sine table is symmetric' },
    { suffix: 'SINE_LENGTH', value: plan.sineTable.length, label: 'Sine table length', unit: 'entries', meaning: 'entries of the sine table, 2^NCO_PHASE_BITS' },
    {
      suffix: 'NCO_GAIN_SHIFT',
      value: control.gainShift,
      label: 'NCO gain shift (right)',
      unit: 'bits',
      meaning: 'tuning increment = round(filter output times NCO_GAIN_CODE / 2^NCO_GAIN_SHIFT); negative means a left shift',
    },
  ];
  // Modes as numbers, so firmware can switch on them (the arithmetic itself: README.txt).
  counts.push(
    { suffix: 'ROUNDING', value: ROUNDING_CODES[plan.rounding], label: 'Rounding mode (0 truncate, 1 nearest, 2 half-even)', unit: '', meaning: `rounding mode ${plan.rounding}: 0 = truncate (toward minus infinity), 1 = nearest (half away from zero), 2 = half-even` },
    { suffix: 'OVERFLOW_SATURATE', value: plan.overflow === 'saturate' ? 1 : 0, label: 'Overflow saturates (1) or wraps (0)', unit: '', meaning: `overflow mode ${plan.overflow}: 1 = saturate, 0 = wrap` },
    { suffix: 'NCO_SQUARE', value: plan.waveform === 'square' ? 1 : 0, label: 'NCO waveform square (1) or sine (0)', unit: '', meaning: `NCO waveform ${plan.waveform}: 0 = sine table, 1 = square (plus or minus NCO_FULL_SCALE)` },
  );
  const clocksPerSample = spec.clockHz / spec.sampleRateHz;
  if (Number.isSafeInteger(clocksPerSample)) {
    counts.push({ suffix: 'CLOCKS_PER_SAMPLE', value: clocksPerSample, label: 'Fabric clock cycles per loop update', unit: 'cycles', meaning: `fabric clock cycles per loop update (${spec.clockHz} Hz / ${spec.sampleRateHz} Hz)` });
  }

  const codes: CodeConstant[] = [
    {
      suffix: 'NCO_TUNING_WORD',
      label: 'NCO tuning word (centre frequency)',
      signedness: 'unsigned',
      widthBits: plan.ncoAccumulatorBits,
      // The exact word as the hardware holds it: two 32-bit halves, joined without a decimal detour.
      code: (BigInt(tuning.tuningWordHi) << 32n) | BigInt(tuning.tuningWordLo),
      meaning: `phase increment per loop update for centerHz ${spec.centerHz} Hz at ${spec.sampleRateHz} Hz (actual ${tuning.actualHz} Hz)`,
    },
    {
      suffix: 'NCO_GAIN_CODE',
      label: 'NCO gain code',
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
        label: `Section ${section.index} coefficient ${name}`,
        signedness: 'signed',
        widthBits: plan.coefficientBits,
        code: toCode(section.codes[name]),
        meaning: `section ${section.index} ${name}, ${qText}, value ${c ? String(Number(c.quantizedValue.toPrecision(12))) : "n/a"}`,
      });
    }
  }
  codes.push(...limits('DATA', plan.dataBits, 'data word'), ...limits('ACC', plan.accumulatorBits, 'filter accumulator'));

  const types: WordType[] = [
    { suffix: 'coef', signedness: 'signed', widthBits: plan.coefficientBits, label: 'Coefficient word format', format: `${qFormat}, signed, ${plan.coefficientBits} bits`, meaning: `filter coefficient, ${qText}` },
    { suffix: 'data', signedness: 'signed', widthBits: plan.dataBits, label: 'Data word format', format: `signed, ${plan.dataBits} bits`, meaning: 'detector and filter data word' },
    { suffix: 'acc', signedness: 'signed', widthBits: plan.accumulatorBits, label: 'Filter accumulator format', format: `signed, ${plan.accumulatorBits} bits`, meaning: 'filter accumulator' },
    { suffix: 'phase', signedness: 'unsigned', widthBits: plan.ncoAccumulatorBits, label: 'NCO phase accumulator format', format: `unsigned, ${plan.ncoAccumulatorBits} bits`, meaning: 'NCO phase accumulator' },
  ];
  const tables: TableConstant[] = [
    {
      suffix: 'SINE',
      label: 'Sine table',
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
    { suffix: `${prefix}_MAX`, label: `Largest ${what} code`, signedness: 'signed', widthBits, code: max, meaning: `largest ${what} code, saturation limit` },
    { suffix: `${prefix}_MIN`, label: `Smallest ${what} code`, signedness: 'signed', widthBits, code: min, meaning: `smallest ${what} code, saturation limit` },
  ];
}
