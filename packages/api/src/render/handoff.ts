/**
 * The language-neutral content of the generated constants: what every artifact states, before any
 * language formats it. Built from the server's dsp results (./fromDsp.ts); each view-model
 * (./views/*.ts) turns it into the literals of one language.
 */
import type { Signedness } from './literals.ts';

/** A small count, width or shift (|value| < 2^31), safe as a VHDL `integer` and a Verilog `integer`. */
export interface CountConstant {
  /** Upper snake case; the full name is the design prefix + "_" + suffix. */
  readonly suffix: string;
  readonly value: number;
  /** Our own wording (never user text); passed through commentText before it reaches a comment. */
  readonly meaning: string;
  /** What a reader calls it (release diff, manifest), and its unit ('' for a mode or a code). */
  readonly label: string;
  readonly unit: string;
}

/** An integer code of a fixed-width word (coefficient, tuning word, limit). */
export interface CodeConstant {
  readonly suffix: string;
  readonly signedness: Signedness;
  readonly widthBits: number;
  readonly code: bigint;
  readonly meaning: string;
  readonly label: string;
}

/** A word format the firmware declares (C typedef, VHDL subtype). */
export interface WordType {
  /** Lower-case in type names: coef -> <name>_coef_t. */
  readonly suffix: string;
  readonly signedness: Signedness;
  readonly widthBits: number;
  readonly meaning: string;
  readonly label: string;
  /** The word as a reader states it: "Q2.16, signed, 18 bits". */
  readonly format: string;
}

/** A ROM of small signed codes (|code| < 2^31, so every language holds them as plain integers). */
export interface TableConstant {
  readonly suffix: string;
  readonly signedness: 'signed';
  readonly widthBits: number;
  readonly codes: readonly number[];
  readonly meaning: string;
  readonly label: string;
}

export interface HandoffModel {
  /** The validated design name. */
  readonly name: string;
  readonly counts: readonly CountConstant[];
  readonly codes: readonly CodeConstant[];
  readonly types: readonly WordType[];
  readonly tables: readonly TableConstant[];
}
