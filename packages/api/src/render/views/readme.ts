/** View-model of templates/readme.txt.hbs: the Q formats and conventions of one release. */
import { bitTrueFormats, type BitTruePlan, type LoopSpec, type QuantizedFilter } from '@loopwright/dsp';
import type { HandoffModel } from '../handoff.ts';
import { codeNames, commentText } from '../identifiers.ts';
import { CAUTION_LINES } from '../caution.ts';
import { clocksPerUpdate } from '@loopwright/dsp';
import { replayWording, rtlReplaySamples, RTL_PARTS, type RtlFileNames, type RtlModel } from '../rtl.ts';

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
  readonly rtl: {
    readonly architecture: readonly string[];
    readonly ports: readonly { name: string; text: string }[];
    readonly run: readonly string[];
    readonly caution: readonly string[];
  };
}

export interface ReadmeInput {
  readonly spec: LoopSpec;
  readonly quantized: QuantizedFilter;
  readonly bitTrue: BitTruePlan;
  readonly model: HandoffModel;
  readonly toolVersion: string;
  readonly specSha256: string;
  readonly files: readonly { name: string; purpose: string }[];
  readonly vectorsFile: string;
  readonly vectorColumns: readonly { name: string; meaning: string }[];
  readonly rtl: RtlModel;
  readonly rtlFiles: RtlFileNames & { readonly vhdlPackage: string };
  /** Golden-vector samples of the release (the testbenches replay the first rtlReplaySamples of them). */
  readonly samples: number;
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

/**
 * The per-sample arithmetic of dsp's bit-true loop (packages/dsp/README.md, "Bit-true arithmetic"),
 * restated with the generated constant names; the golden vectors follow it bit for bit.
 */
function arithmeticSteps(prefix: string, rounding: string, overflow: string): string[] {
  const c = (s: string) => `${prefix}_${s}`;
  return [
    `Symbols: D = ${c('DATA_BITS')}, Wc = ${c('COEF_BITS')}, Fc = ${c('COEF_FRACTION_BITS')}, Wa = ${c('ACC_BITS')}, N = ${c('NCO_ACC_BITS')}, P = ${c('NCO_PHASE_BITS')}, B = ${c('NCO_AMPLITUDE_BITS')}, FS = ${c('NCO_FULL_SCALE')}, M = ${c('NCO_TUNING_WORD')}, G = ${c('NCO_GAIN_CODE')}, S = ${c('NCO_GAIN_SHIFT')}.`,
    `round_s(p), s >= 1 (this release rounds "${rounding}"): q = p >> s (arithmetic shift, floor), r = p - q*2^s, h = 2^(s-1); truncate gives q; nearest gives q + 1 if r > h or (r = h and p >= 0); half-even gives q + 1 if r > h or (r = h and q odd); round_0(p) = p.`,
    `reduce_W(v) (this release uses "${overflow}"): saturate clamps to [-2^(W-1), 2^(W-1) - 1]; wrap keeps the low W bits, sign-extended.`,
    'Per sample n (state: phase register; per section x1, x2, y1, y2; all start at 0):',
    '1. x = input code (D bits; the golden vectors give it).',
    '2. a = ((phase >> (N - P)) + 2^(P-2)) mod 2^P: the top P phase bits plus a quarter turn, so the table gives cos.',
    `3. c = ${c('SINE')}[a] for the sine waveform; for the square waveform c = +FS if a < 2^(P-1), else -FS.`,
    '4. detector u = reduce_D(round_(B-1)(x*c)).',
    '5. each section in index order, v = u into the first: acc = b0*v + b1*x1 + b2*x2 - a1*y1 - a2*y2, exact;',
    '   if Wa < Wc + D + 1 then acc = reduce_Wa(acc); y = reduce_D(round_Fc(acc)); x2 = x1, x1 = v, y2 = y1, y1 = y; v = y.',
    '6. filter output y = v of the last section.',
    '7. tuning increment d = round_S(y*G) if S > 0, else y*G*2^(-S).',
    '8. phase = (phase + M + d) mod 2^N.',
  ];
}

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
  const names = codeNames(model.name);
  const qm = (w: number, f: number) => `Q${w - f}.${f}, ${w} bits signed, ${f} fraction bits`;
  return {
    designName: model.name,
    toolVersion: commentText(input.toolVersion),
    specSha256: input.specSha256,
    caution: CAUTION_LINES,
    files: input.files,
    formats: bitTrueFormats(input.bitTrue).map((f) => ({
      what: `${f.signal} (${f.description})`,
      format: f.signed ? `${qm(f.wordBits, f.fractionBits)}` : `${f.wordBits} bits unsigned, ${f.fractionBits} fraction bits`,
    })),
    arithmetic: [
      `Rounding: ${ROUNDING_TEXT[fp.rounding]}${quantized.fractionBitsAuto ? '; coefficient fraction bits chosen automatically (the most that hold every coefficient)' : ''}.`,
      `Overflow: ${OVERFLOW_TEXT[fp.overflow]}; the input always saturates, as an ADC clips.`,
      `Loop update rate ${spec.sampleRateHz} Hz on a ${spec.clockHz} Hz fabric clock; NCO centre ${spec.centerHz} Hz.`,
      ...arithmeticSteps(names.prefix, fp.rounding, fp.overflow),
    ],
    conventions: CONVENTIONS,
    vectorsFile: input.vectorsFile,
    vectorColumns: input.vectorColumns,
    vhdlPackage: names.vhdlPackage,
    constants: model.codes.map((c) => ({ name: names.constant(c.suffix), code: String(c.code) })),
    rtl: rtlSection(input),
  };
}

/** Architecture, ports and how to run the testbenches of the reference RTL (src/render/rtl.ts). */
function rtlSection(input: ReadmeInput): ReadmeView['rtl'] {
  const { rtl, rtlFiles: f, spec, bitTrue: plan } = input;
  const t = rtl.timing;
  const available = clocksPerUpdate(spec.clockHz, spec.sampleRateHz);
  const e = rtl.entities;
  const rom = plan.waveform === 'square'
    ? 'no table: the square wave is +/-(2^(B-1) - 1) from the top address bit'
    : `one ROM of 2^${plan.phaseBits} x ${plan.amplitudeBits} = ${plan.sineTable.length * plan.amplitudeBits} bits (the sine table), read through a register`;
  return {
    architecture: [
      `Entities (modules): ${e.round} (round_s then reduce, as in ARITHMETIC), ${e.nco} (phase accumulator, table, control scaling), ${e.detector}, ${e.section} (one second-order section), ${e.loop} (top).`,
      `Sequential: the detector takes 1 clock, each section 6 (five multiply-accumulates on one multiplier and one to round and update its state), the NCO advance 1 and the table read 1.`,
      `Cycles per sample: ${t.cyclesPerSample} = 6 x ${t.sectionCount} sections + 3; sample_strobe may come at most once every ${t.cyclesPerSample} clocks.`,
      `Latency: valid rises ${t.latencyCycles} clocks after the edge that samples sample_strobe.`,
      `This spec gives ${available} clocks per loop update (clockHz ${spec.clockHz} / sampleRateHz ${spec.sampleRateHz}): ${available >= t.cyclesPerSample ? 'enough for this architecture' : 'NOT enough for this architecture; the analysis warns on clockHz'}.`,
      `Multipliers: ${t.multipliers} (detector, one per section, NCO control scaling); ${rom}.`,
      `Section MAC: the five products sum exactly in Wc + D + 2 bits, then reduce to Wa when Wa < Wc + D + 1, exactly as step 5 of ARITHMETIC.`,
    ],
    ports: rtl.ports.map((p) => ({
      name: p.name,
      text: `${p.direction === 'in' ? 'in ' : 'out'} ${p.kind === 'bit' ? '1 bit' : `${p.widthBits} bits ${p.kind}`}: ${p.meaning}`,
    })),
    run: [
      `Both testbenches read the ${input.vectorColumns.length - 1} hex files from the working directory, replay ${replayWording(rtlReplaySamples(input.samples), input.samples)} (as the server's verification does) and end with one line:`,
      '"PASS <samples> samples", or "FAIL sample <n> signal <column> expected <value> got <value>" and a non-zero exit.',
      `GHDL:   ghdl -a --std=08 ${[f.vhdlPackage, ...RTL_PARTS.map((p) => f.vhdl[p]), f.vhdlTestbench].join(' ')}`,
      `        ghdl -e --std=08 ${e.testbench} && ghdl -r --std=08 ${e.testbench}`,
      `Icarus: iverilog -g2005 -o ${e.testbench}.vvp ${[...RTL_PARTS.map((p) => f.verilog[p]), f.verilogTestbench].join(' ')}`,
      `        vvp -n ${e.testbench}.vvp`,
      `Lint:   verilator --lint-only -Wall --top-module ${e.loop} ${RTL_PARTS.map((p) => f.verilog[p]).join(' ')}`,
      `Generics/parameters SAMPLES (samples to replay, at most ${input.samples}) and STROBE_PERIOD (clocks between strobes, at least ${t.cyclesPerSample}): ghdl -r ... -gSAMPLES=${input.samples}, iverilog -P${e.testbench}.SAMPLES=${input.samples} replay the whole record.`,
      'Or, with Loopwright: npm run -s loopwright -- verify <this folder> (runs whichever simulators are installed).',
    ],
    caution: [
      'The reference RTL is a model to verify your implementation against, bit for bit: it is written for clarity,',
      'not for timing closure, area or your device. Its cycle count is fixed by the architecture above.',
      'Review it, simulate your own design against the golden vectors, and verify on the bench before it drives hardware.',
    ],
  };
}
