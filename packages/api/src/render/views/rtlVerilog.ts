/** View-models of templates/rtl-loop.v.hbs and rtl-testbench.v.hbs: the reference loop in Verilog-2005. */
import type { HexMemoryFile } from '../hexVectors.ts';
import { codeNames } from '../identifiers.ts';
import { verilogLiteral } from '../literals.ts';
import { CHECKED_COLUMNS, RTL_CONSTANTS, RTL_PARTS, rtlConstantNames, rtlReplaySamples, namedSections, type RtlModel, type RtlPart } from '../rtl.ts';
import type { ArtifactHeader } from './header.ts';

type Widths = Record<keyof RtlModel['widths'], string>;

export interface RtlVerilogView {
  readonly header: ArtifactHeader;
  readonly include: string;
  readonly testbenchFile: string;
  readonly cyclesPerSample: string;
  readonly modules: Omit<RtlModel['entities'], 'testbench'>;
  readonly sineFunction: string;
  readonly ranges: Widths;
  readonly zeros: Widths;
  readonly names: Readonly<Record<keyof typeof RTL_CONSTANTS, string>>;
  readonly sections: ReturnType<typeof namedSections>;
  readonly last: { readonly output: string; readonly done: string };
}

export interface RtlTestbenchVerilogView {
  readonly header: ArtifactHeader;
  readonly module: string;
  readonly loopModule: string;
  /** The RTL files in compile order, space-separated. */
  readonly rtlFiles: string;
  readonly length: string;
  /** Samples replayed unless SAMPLES says otherwise (rtl.ts, rtlReplaySamples). */
  readonly replay: string;
  readonly cyclesPerSample: string;
  readonly ranges: Widths;
  readonly zeros: Widths;
  readonly inputMemory: string;
  readonly columns: readonly { memory: string; range: string; file: string }[];
  readonly checks: readonly { signal: string; got: string; memory: string; expectedValue: string; gotValue: string }[];
}


function ranges(rtl: RtlModel): Widths {
  const w = rtl.widths;
  return { data: `[${w.data - 1}:0]`, amplitude: `[${w.amplitude - 1}:0]`, phase: `[${w.phase - 1}:0]`, address: `[${w.address - 1}:0]` };
}

function zeros(rtl: RtlModel): Widths {
  const w = rtl.widths;
  return {
    data: verilogLiteral(0n, 'signed', w.data),
    amplitude: verilogLiteral(0n, 'signed', w.amplitude),
    phase: verilogLiteral(0n, 'unsigned', w.phase),
    address: verilogLiteral(0n, 'unsigned', w.address),
  };
}

export interface VerilogFiles {
  readonly include: string;
  readonly parts: Readonly<Record<RtlPart, string>>;
  readonly testbench: string;
}

export function rtlVerilogView(rtl: RtlModel, header: ArtifactHeader, files: VerilogFiles): RtlVerilogView {
  const names = codeNames(rtl.name);
  const { testbench: _tb, ...modules } = rtl.entities;
  const last = rtl.sections[rtl.sections.length - 1]!;
  return {
    header,
    include: files.include,
    testbenchFile: files.testbench,
    cyclesPerSample: String(rtl.timing.cyclesPerSample),
    modules,
    sineFunction: names.constant('SINE'),
    ranges: ranges(rtl),
    zeros: zeros(rtl),
    names: rtlConstantNames(names.constant),
    sections: namedSections(rtl, names.constant),
    last: { output: last.output, done: last.done },
  };
}

export function rtlTestbenchVerilogView(rtl: RtlModel, header: ArtifactHeader, files: VerilogFiles, hex: readonly HexMemoryFile[], length: number): RtlTestbenchVerilogView {
  const memory = (column: string) => `golden_${column}`;
  const byColumn = new Map(hex.map((h) => [h.column, h]));
  return {
    header,
    module: rtl.entities.testbench,
    loopModule: rtl.entities.loop,
    rtlFiles: RTL_PARTS.map((p) => files.parts[p]).join(' '),
    length: String(length),
    replay: String(rtlReplaySamples(length)),
    cyclesPerSample: String(rtl.timing.cyclesPerSample),
    ranges: ranges(rtl),
    zeros: zeros(rtl),
    inputMemory: memory('input_code'),
    columns: hex.map((h) => ({ memory: memory(h.column), range: `[${h.widthBits - 1}:0]`, file: h.fileName })),
    checks: CHECKED_COLUMNS.map(({ column, port }) => ({
      signal: column,
      got: port,
      memory: memory(column),
      expectedValue: byColumn.get(column)?.signed ? `$signed(${memory(column)}[checked])` : `${memory(column)}[checked]`,
      gotValue: port,
    })),
  };
}
