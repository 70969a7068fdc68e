/** View-model of templates/readme.txt.hbs: the Q formats and conventions of one release. */
import type { LoopSpec, QuantizedFilter } from '@loopwright/dsp';
import type { HandoffModel } from '../handoff.ts';
import { codeNames, commentText } from '../identifiers.ts';
import { CAUTION_LINES } from '../caution.ts';

export interface ReadmeView {
  readonly designName: string;
  readonly toolVersion: string;
  readonly specSha256: string;
  readonly caution: readonly string[];
  readonly files: readonly { name: string; purpose: string }[];
  readonly formats: readonly { what: string; format: string }[];
  readonly arithmetic: readonly string[];
  readonly conventions: readonly string[];
  readonly vectorsFile: string;
  readonly vectorColumns: readonly { name: string; meaning: string }[];
  readonly vhdlPackage: string;
  readonly constants: readonly { name: string; code: string }[];
}

export interface ReadmeInput {
  readonly spec: LoopSpec;
  readonly quantized: QuantizedFilter;
  readonly model: HandoffModel;
  readonly toolVersion: string;
  readonly specSha256: string;
  readonly files: readonly { name: string; purpose: string }[];
  readonly vectorsFile: string;
  readonly vectorColumns: readonly { name: string; meaning: string }[];
}

const ROUNDING_TEXT: Record<LoopSpec['fixedPoint']['rounding'], string> = {
  nearest: 'nearest: round half away from zero (IEEE 754 roundTiesToAway)',
  'half-even': 'half-even: round half to even, convergent (IEEE 754 roundTiesToEven)',
  truncate: "truncate: drop the low bits, two's-complement truncation toward minus infinity (IEEE 754 roundTowardNegative)",
};

const OVERFLOW_TEXT: Record<LoopSpec['fixedPoint']['overflow'], string> = {
  saturate: 'saturate: a result outside the word is clamped to the _MIN/_MAX limit of the word',
  wrap: "wrap: a result outside the word keeps its low bits (two's-complement wrap-around)",
};

/** DESIGN.md "Conventions the numbers follow", restated for the firmware engineer. */
const CONVENTIONS: readonly string[] = [
  'Open loop L(s) = Kd*Ko*F(s)/s, Ko = 2*pi*gainHzPerUnit rad/s per unit of control, Kd = A_in*A_nco/2 per radian (multiplier detector, A_nco = 1 at full scale).',
  'The NCO runs at the loop rate sampleRateHz: an accumulator with one sample of delay, Ko*T*z^-1/(1 - z^-1).',
  'Loop filter discretised by the bilinear transform s = 2*fs*(1 - z^-1)/(1 + z^-1), prewarped at prewarpHz when given.',
  'Digital transfer functions are b/a with a[0] = 1; each section computes y = b0*x + b1*x[-1] + b2*x[-2] - a1*y[-1] - a2*y[-2]; sections run in cascade in index order.',
  'NCO tuning word M = round(centerHz * 2^N / sampleRateHz) for an N-bit phase accumulator; the sine table is addressed by the top NCO_PHASE_BITS bits.',
];

export function readmeView(input: ReadmeInput): ReadmeView {
  const { spec, quantized, model } = input;
  const fp = spec.fixedPoint;
  const q = quantized.format;
  const names = codeNames(model.name);
  const qm = (w: number, f: number) => `Q${w - f}.${f}, ${w} bits signed, ${f} fraction bits`;
  return {
    designName: model.name,
    toolVersion: commentText(input.toolVersion),
    specSha256: input.specSha256,
    caution: CAUTION_LINES,
    files: input.files,
    formats: [
      { what: 'loop filter coefficients', format: `${qm(q.wordBits, q.fractionBits)}${quantized.fractionBitsAuto ? ' (fraction bits chosen automatically)' : ''}` },
      { what: 'detector and filter data', format: `${fp.dataBits} bits signed, full scale 1.0 = 2^${fp.dataBits - 1}` },
      { what: 'filter accumulator', format: `${fp.accumulatorBits} bits signed` },
      { what: 'NCO phase accumulator', format: `${spec.nco.accumulatorBits} bits unsigned, one full turn = 2^${spec.nco.accumulatorBits}` },
      { what: 'NCO output', format: `${spec.nco.amplitudeBits} bits signed, ${spec.nco.waveform} waveform` },
    ],
    arithmetic: [
      `Rounding: ${ROUNDING_TEXT[fp.rounding]}.`,
      `Overflow: ${OVERFLOW_TEXT[fp.overflow]}.`,
      `Loop update rate ${spec.sampleRateHz} Hz on a ${spec.clockHz} Hz fabric clock; NCO centre ${spec.centerHz} Hz.`,
    ],
    conventions: CONVENTIONS,
    vectorsFile: input.vectorsFile,
    vectorColumns: input.vectorColumns,
    vhdlPackage: names.vhdlPackage,
    constants: model.codes.map((c) => ({ name: names.constant(c.suffix), code: String(c.code) })),
  };
}
