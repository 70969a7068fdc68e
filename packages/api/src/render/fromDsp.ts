/**
 * Builds the language-neutral constants (./handoff.ts) from the server's dsp results.
 * Only numbers and fixed wording enter; the design name is the sole identifier source.
 */
import type { BitTruePlan, LoopSpec, QuantizedFilter } from '@loopwright/dsp';
import type { CodeConstant, CountConstant, HandoffModel, TableConstant, WordType } from './handoff.ts';
import { codeRange, toCode } from './literals.ts';

export interface HandoffInput {
  readonly spec: LoopSpec;
  readonly quantized: QuantizedFilter;
  /** The bit-true loop's constants: tuning word, control scaling, sine table (dsp's planBitTrue). */
  readonly plan: BitTruePlan;
}

const COEFFICIENT_NAMES = ['b0', 'b1', 'b2', 'a1', 'a2'] as const;
const ROUNDING_CODES: Readonly<Record<LoopSpec['fixedPoint']['rounding'], number>> = { truncate: 0, nearest: 1, 'half-even': 2 };

export function handoffModel({ spec, quantized, plan }: HandoffInput): HandoffModel {
  const { tuning, control } = plan;
  const fp = spec.fixedPoint;
  const q = quantized.format;
  const qText = `Q${q.wordBits - q.fractionBits}.${q.fractionBits} (${q.wordBits} bits, ${q.fractionBits} fraction bits)`;
  const counts: CountConstant[] = [
    { suffix: 'DATA_BITS', value: fp.dataBits, meaning: 'width of detector and filter data words, signed' },
    { suffix: 'COEF_BITS', value: q.wordBits, meaning: 'width of filter coefficient words, signed' },
    { suffix: 'COEF_FRACTION_BITS', value: q.fractionBits, meaning: `fraction bits of every coefficient: ${qText}` },
    { suffix: 'ACC_BITS', value: fp.accumulatorBits, meaning: 'width of the filter accumulator, signed' },
    { suffix: 'SECTION_COUNT', value: quantized.sections.length, meaning: 'second-order sections of the loop filter, in cascade order' },
    { suffix: 'NCO_ACC_BITS', value: spec.nco.accumulatorBits, meaning: 'width of the NCO phase accumulator, unsigned' },
    { suffix: 'NCO_PHASE_BITS', value: spec.nco.phaseBits, meaning: 'sine table address bits: the top bits of the phase accumulator' },
    { suffix: 'NCO_AMPLITUDE_BITS', value: spec.nco.amplitudeBits, meaning: 'width of NCO output samples, signed' },
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
    { suffix: 'ROUNDING', value: ROUNDING_CODES[fp.rounding], meaning: `rounding mode ${fp.rounding}: 0 = truncate (toward minus infinity), 1 = nearest (half away from zero), 2 = half-even` },
    { suffix: 'OVERFLOW_SATURATE', value: fp.overflow === 'saturate' ? 1 : 0, meaning: `overflow mode ${fp.overflow}: 1 = saturate, 0 = wrap` },
    { suffix: 'NCO_SQUARE', value: spec.nco.waveform === 'square' ? 1 : 0, meaning: `NCO waveform ${spec.nco.waveform}: 0 = sine table, 1 = square (plus or minus NCO_FULL_SCALE)` },
  );
  const clocksPerSample = spec.clockHz / spec.sampleRateHz;
  if (Number.isSafeInteger(clocksPerSample)) {
    counts.push({ suffix: 'CLOCKS_PER_SAMPLE', value: clocksPerSample, meaning: `fabric clock cycles per loop update (${spec.clockHz} Hz / ${spec.sampleRateHz} Hz)` });
  }

  const codes: CodeConstant[] = [
    {
      suffix: 'NCO_TUNING_WORD',
      signedness: 'unsigned',
      widthBits: spec.nco.accumulatorBits,
      code: BigInt(tuning.tuningWordDecimal),
      meaning: `phase increment per loop update for centerHz ${spec.centerHz} Hz at ${spec.sampleRateHz} Hz (actual ${tuning.actualHz} Hz)`,
    },
    {
      suffix: 'NCO_GAIN_CODE',
      signedness: 'signed',
      widthBits: q.wordBits,
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
        widthBits: q.wordBits,
        code: toCode(section.codes[name]),
        meaning: `section ${section.index} ${name}, ${qText}, value ${c ? String(Number(c.quantizedValue.toPrecision(12))) : "n/a"}`,
      });
    }
  }
  codes.push(...limits('DATA', fp.dataBits, 'data word'), ...limits('ACC', fp.accumulatorBits, 'filter accumulator'));

  const types: WordType[] = [
    { suffix: 'coef', signedness: 'signed', widthBits: q.wordBits, meaning: `filter coefficient, ${qText}` },
    { suffix: 'data', signedness: 'signed', widthBits: fp.dataBits, meaning: 'detector and filter data word' },
    { suffix: 'acc', signedness: 'signed', widthBits: fp.accumulatorBits, meaning: 'filter accumulator' },
    { suffix: 'phase', signedness: 'unsigned', widthBits: spec.nco.accumulatorBits, meaning: 'NCO phase accumulator' },
  ];
  const tables: TableConstant[] = [
    {
      suffix: 'SINE',
      signedness: 'signed',
      widthBits: spec.nco.amplitudeBits,
      codes: Array.from(plan.sineTable),
      meaning: `sine table: entry k = round((2^(B-1) - 1) sin(2 pi k / 2^P)), B = ${spec.nco.amplitudeBits}, P = ${spec.nco.phaseBits}; address (phase >> (N - P)) + 2^(P-2) mod 2^P gives cos`,
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
