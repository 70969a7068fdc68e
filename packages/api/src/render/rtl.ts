/**
 * The language-neutral content of the reference RTL (templates/rtl-loop.*.hbs and the testbenches):
 * entity names, the section cascade, the timing and the ports, from the bit-true plan. Each view-model
 * (./views/rtl*.ts) turns it into one language. Names come only from the validated design name.
 */
import { referenceRtlTiming, type BitTruePlan, type ReferenceRtlTiming } from '@loopwright/dsp';
import { codeNames } from './identifiers.ts';
import { countText } from './countText.ts';

export const COEFFICIENT_SUFFIXES = ['B0', 'B1', 'B2', 'A1', 'A2'] as const;

/** One second-order section instance and the signals that chain it to its neighbours. */
export interface RtlSection {
  readonly index: number;
  readonly instance: string;
  /** The signal that starts it and the one it reads: the detector's for section 0, else the previous section's. */
  readonly start: string;
  readonly input: string;
  readonly output: string;
  readonly done: string;
  /** Constant suffixes of its coefficients (S<k>_B0 …), named per language by the views. */
  readonly coefficients: Readonly<Record<(typeof COEFFICIENT_SUFFIXES)[number], string>>;
}

export interface RtlPort {
  readonly name: string;
  readonly direction: 'in' | 'out';
  readonly widthBits: number;
  readonly kind: 'signed' | 'unsigned' | 'bit';
  readonly meaning: string;
}

export interface RtlModel {
  readonly name: string;
  readonly entities: { readonly round: string; readonly nco: string; readonly detector: string; readonly section: string; readonly loop: string; readonly testbench: string };
  readonly sections: readonly RtlSection[];
  readonly timing: ReferenceRtlTiming;
  readonly ports: readonly RtlPort[];
  readonly widths: { readonly data: number; readonly amplitude: number; readonly phase: number; readonly address: number };
}

export function rtlModel(name: string, plan: BitTruePlan): RtlModel {
  codeNames(name);
  const sections: RtlSection[] = Array.from({ length: plan.sectionCount }, (_, k) => ({
    index: k,
    instance: `u_section${k}`,
    start: k === 0 ? 'detector_done' : `section${k - 1}_done`,
    input: k === 0 ? 'detector_u' : `section${k - 1}_y`,
    output: `section${k}_y`,
    done: `section${k}_done`,
    coefficients: { B0: `S${k}_B0`, B1: `S${k}_B1`, B2: `S${k}_B2`, A1: `S${k}_A1`, A2: `S${k}_A2` },
  }));
  const d = plan.dataBits;
  const ports: RtlPort[] = [
    { name: 'clk', direction: 'in', widthBits: 1, kind: 'bit', meaning: 'fabric clock; every register updates on its rising edge' },
    { name: 'rst', direction: 'in', widthBits: 1, kind: 'bit', meaning: 'synchronous reset, active high: phase, section states and outputs to 0' },
    { name: 'sample_strobe', direction: 'in', widthBits: 1, kind: 'bit', meaning: 'one-clock pulse at the loop rate (a clock enable): starts one loop update with sample_in' },
    { name: 'sample_in', direction: 'in', widthBits: d, kind: 'signed', meaning: 'input sample x, read on the strobe' },
    { name: 'nco_out', direction: 'out', widthBits: plan.amplitudeBits, kind: 'signed', meaning: 'NCO output code c that this update multiplied (golden column nco_code)' },
    { name: 'detector_out', direction: 'out', widthBits: d, kind: 'signed', meaning: 'detector output u (golden column detector_code)' },
    { name: 'filter_out', direction: 'out', widthBits: d, kind: 'signed', meaning: 'loop-filter output y, the last section (golden column filter_code)' },
    { name: 'valid', direction: 'out', widthBits: 1, kind: 'bit', meaning: 'one-clock pulse: every output holds this update\'s values' },
    { name: 'phase_out', direction: 'out', widthBits: plan.ncoAccumulatorBits, kind: 'unsigned', meaning: 'NCO phase before this update advanced it (golden column nco_phase)' },
    { name: 'address_out', direction: 'out', widthBits: plan.phaseBits, kind: 'unsigned', meaning: 'sine-table address of nco_out (golden column table_address)' },
  ];
  return {
    name,
    entities: {
      round: `${name}_round`,
      nco: `${name}_nco`,
      detector: `${name}_detector`,
      section: `${name}_section`,
      loop: `${name}_loop`,
      testbench: `${name}_loop_tb`,
    },
    sections,
    timing: referenceRtlTiming(plan.sectionCount),
    ports,
    widths: { data: d, amplitude: plan.amplitudeBits, phase: plan.ncoAccumulatorBits, address: plan.phaseBits },
  };
}

/** The golden columns the testbenches compare, each with the loop port that must equal it. */
export const CHECKED_COLUMNS = [
  { column: 'nco_phase', port: 'phase_out' },
  { column: 'table_address', port: 'address_out' },
  { column: 'nco_code', port: 'nco_out' },
  { column: 'detector_code', port: 'detector_out' },
  { column: 'filter_code', port: 'filter_out' },
] as const;

/** The reference RTL's files, one entity/module each, in analysis order (the testbench last). */
export const RTL_PARTS = ['round', 'nco', 'detector', 'section', 'loop'] as const;
export type RtlPart = (typeof RTL_PARTS)[number];

export interface RtlFileNames {
  readonly vhdl: Readonly<Record<RtlPart, string>>;
  readonly verilog: Readonly<Record<RtlPart, string>>;
  readonly vhdlTestbench: string;
  readonly verilogTestbench: string;
}

export function rtlFileNames(name: string): RtlFileNames {
  codeNames(name);
  const per = (ext: string) => Object.fromEntries(RTL_PARTS.map((p) => [p, `${name}_${p}.${ext}`])) as Record<RtlPart, string>;
  return { vhdl: per('vhd'), verilog: per('v'), vhdlTestbench: `${name}_loop_tb.vhd`, verilogTestbench: `${name}_loop_tb.v` };
}

/** The generated constants the loop passes to its entities (suffixes of codeNames().constant). */
export const RTL_CONSTANTS = {
  dataBits: 'DATA_BITS',
  coefBits: 'COEF_BITS',
  coefFractionBits: 'COEF_FRACTION_BITS',
  accBits: 'ACC_BITS',
  ncoAccBits: 'NCO_ACC_BITS',
  phaseBits: 'NCO_PHASE_BITS',
  amplitudeBits: 'NCO_AMPLITUDE_BITS',
  gainShift: 'NCO_GAIN_SHIFT',
  rounding: 'ROUNDING',
  saturate: 'OVERFLOW_SATURATE',
  square: 'NCO_SQUARE',
  tuningWord: 'NCO_TUNING_WORD',
  gainCode: 'NCO_GAIN_CODE',
} as const;

/** RTL_CONSTANTS named in one language (Verilog/C names or VHDL identifiers). */
export function rtlConstantNames(name: (suffix: string) => string): Record<keyof typeof RTL_CONSTANTS, string> {
  return Object.fromEntries(Object.entries(RTL_CONSTANTS).map(([k, s]) => [k, name(s)])) as Record<keyof typeof RTL_CONSTANTS, string>;
}

/** The section instances with their coefficient constants named in one language (the views' shared rows). */
export function namedSections(rtl: RtlModel, name: (suffix: string) => string) {
  return rtl.sections.map((s) => ({
    instance: s.instance,
    start: s.start,
    input: s.input,
    output: s.output,
    done: s.done,
    b0: name(s.coefficients.B0),
    b1: name(s.coefficients.B1),
    b2: name(s.coefficients.B2),
    a1: name(s.coefficients.A1),
    a2: name(s.coefficients.A2),
  }));
}

/**
 * Samples the reference RTL testbenches replay unless told otherwise, and so the server's
 * verification: the first 4096 of the golden vectors, which hold the acquisition of every demo loop
 * (they lock after 112–900 samples). GHDL and Icarus run these testbenches at 260–2000 samples/s on
 * the 2-core development machine (packages/api/README.md, "Reference-RTL benchmark"), so the whole 65 536-sample record would
 * take 30–250 s per simulator and release; SAMPLES replays more by hand.
 */
export const RTL_REPLAY_SAMPLES = 4096;

/** What the testbenches of a record of `recordSamples` replay by default. */
export function rtlReplaySamples(recordSamples: number): number {
  return Math.min(RTL_REPLAY_SAMPLES, recordSamples);
}

/**
 * How many golden samples a replay covered, for a sentence: "the first 4,096 of the 65,536 golden
 * samples", or "all 4,096 golden samples" when it covered the record.
 */
export function replayWording(replayedSamples: number, recordSamples: number): string {
  return replayedSamples >= recordSamples
    ? `all ${countText(recordSamples)} golden samples`
    : `the first ${countText(replayedSamples)} of the ${countText(recordSamples)} golden samples`;
}

/**
 * What the manifest records of the reference RTL: its timing, the multipliers and ROM bits it has
 * by construction, and how many golden samples its testbenches replay. The yosys estimate is not
 * here: the server makes it after the cut, beside the release, and a manifest's hash is fixed at the cut.
 */
export function referenceRtlSummary(plan: BitTruePlan, recordSamples: number) {
  return {
    ...referenceRtlTiming(plan.sectionCount),
    romBits: plan.waveform === 'square' ? 0 : plan.sineTable.length * plan.amplitudeBits,
    testbenchSamples: rtlReplaySamples(recordSamples),
    resourceEstimate: 'yosys, made by the server after the cut: see the release verification record',
  };
}
