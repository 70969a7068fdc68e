/** View-models of templates/rtl-loop.vhd.hbs and rtl-testbench.vhd.hbs: the reference loop in VHDL-2008. */
import type { HexMemoryFile } from '../hexVectors.ts';
import { codeNames } from '../identifiers.ts';
import { CHECKED_COLUMNS, RTL_CONSTANTS, RTL_PARTS, rtlConstantNames, rtlReplaySamples, namedSections, type RtlModel, type RtlPart } from '../rtl.ts';
import type { ArtifactHeader } from './header.ts';


type Names = Readonly<Record<keyof typeof RTL_CONSTANTS, string>>;

export interface RtlVhdlView {
  readonly header: ArtifactHeader;
  readonly packageName: string;
  readonly packageFile: string;
  readonly testbenchFile: string;
  readonly cyclesPerSample: string;
  readonly entities: Omit<RtlModel['entities'], 'testbench'>;
  readonly sineTable: string;
  readonly names: Names;
  readonly sections: ReturnType<typeof namedSections>;
  readonly last: { readonly output: string; readonly done: string };
}

export interface RtlTestbenchVhdlView {
  readonly header: ArtifactHeader;
  readonly entity: string;
  readonly loopEntity: string;
  readonly packageName: string;
  readonly packageFile: string;
  /** The RTL files in analysis order, space-separated. */
  readonly rtlFiles: string;
  readonly length: string;
  /** Samples replayed unless SAMPLES says otherwise (rtl.ts, rtlReplaySamples). */
  readonly replay: string;
  readonly cyclesPerSample: string;
  readonly names: Names;
  /** The input column's hex file and the bits of one of its lines (4 per digit). */
  readonly input: { readonly file: string; readonly lineBits: string };
  /** Per compared column: its file, the variable a line is read into, and how the port compares. */
  readonly checks: readonly { signal: string; got: string; file: string; handle: string; word: string; lineBits: string; type: string; width: string }[];
}

export interface VhdlFiles {
  readonly package: string;
  readonly parts: Readonly<Record<RtlPart, string>>;
  readonly testbench: string;
}

export function rtlVhdlView(rtl: RtlModel, header: ArtifactHeader, files: VhdlFiles): RtlVhdlView {
  const names = codeNames(rtl.name);
  const { testbench: _tb, ...entities } = rtl.entities;
  const last = rtl.sections[rtl.sections.length - 1]!;
  return {
    header,
    packageName: names.vhdlPackage,
    packageFile: files.package,
    testbenchFile: files.testbench,
    cyclesPerSample: String(rtl.timing.cyclesPerSample),
    entities,
    sineTable: names.vhdlConstant('SINE'),
    names: rtlConstantNames(names.vhdlConstant),
    sections: namedSections(rtl, names.vhdlConstant),
    last: { output: last.output, done: last.done },
  };
}

export function rtlTestbenchVhdlView(
  rtl: RtlModel,
  header: ArtifactHeader,
  files: VhdlFiles,
  hex: readonly HexMemoryFile[],
  length: number,
): RtlTestbenchVhdlView {
  const names = codeNames(rtl.name);
  const byColumn = new Map(hex.map((h) => [h.column, h]));
  const input = byColumn.get('input_code')!;
  return {
    header,
    entity: rtl.entities.testbench,
    loopEntity: rtl.entities.loop,
    packageName: names.vhdlPackage,
    packageFile: files.package,
    rtlFiles: RTL_PARTS.map((p) => files.parts[p]).join(' '),
    length: String(length),
    replay: String(rtlReplaySamples(length)),
    cyclesPerSample: String(rtl.timing.cyclesPerSample),
    names: rtlConstantNames(names.vhdlConstant),
    input: { file: input.fileName, lineBits: String(4 * input.digits) },
    checks: CHECKED_COLUMNS.map(({ column, port }) => {
      const h = byColumn.get(column)!;
      return {
        signal: column,
        got: port,
        file: h.fileName,
        handle: `golden_${column}_file`,
        word: `golden_${column}`,
        lineBits: String(4 * h.digits),
        type: h.signed ? 'signed' : 'unsigned',
        width: String(h.widthBits),
      };
    }),
  };
}
