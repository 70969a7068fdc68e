/**
 * The reference RTL files of a release: one VHDL and one Verilog file per entity (RTL_PARTS), and the
 * self-checking testbench of each language. Rendered from the same RtlModel, so both languages name
 * the same entities, ports and constants.
 */
import { artifactFile, type ArtifactFile } from './artifactFile.ts';
import type { HexMemoryFile } from './hexVectors.ts';
import { RTL_PARTS, type RtlFileNames, type RtlModel } from './rtl.ts';
import { renderTemplate, type TemplateId } from './templates.ts';
import type { ArtifactHeader } from './views/header.ts';
import { rtlTestbenchVerilogView, rtlVerilogView } from './views/rtlVerilog.ts';
import { rtlTestbenchVhdlView, rtlVhdlView } from './views/rtlVhdl.ts';

export interface RtlInputs {
  readonly rtl: RtlModel;
  readonly files: RtlFileNames;
  /** The constants this RTL reads: the VHDL package and the Verilog include. */
  readonly vhdlPackageFile: string;
  readonly verilogIncludeFile: string;
  readonly hex: readonly HexMemoryFile[];
  readonly samples: number;
  readonly header: (fileName: string) => ArtifactHeader;
}

const PART_TEXT: Readonly<Record<(typeof RTL_PARTS)[number], string>> = {
  round: 'rounding and overflow (round_s, reduce_W)',
  nco: 'NCO: phase accumulator, sine table, control scaling',
  detector: 'multiplier detector',
  section: 'one second-order section on one time-shared multiplier',
  loop: 'top of the reference loop',
};

/** File names and what each holds, for README.txt's file list. */
export function rtlPurposes(files: RtlFileNames): { name: string; purpose: string }[] {
  return [
    ...RTL_PARTS.map((p) => ({ name: files.vhdl[p], purpose: `reference RTL, VHDL-2008: ${PART_TEXT[p]}` })),
    { name: files.vhdlTestbench, purpose: 'self-checking VHDL-2008 testbench: replays the golden vectors' },
    ...RTL_PARTS.map((p) => ({ name: files.verilog[p], purpose: `reference RTL, Verilog-2005: ${PART_TEXT[p]}` })),
    { name: files.verilogTestbench, purpose: 'self-checking Verilog-2005 testbench: replays the golden vectors' },
  ];
}

export function renderRtl(input: RtlInputs): ArtifactFile[] {
  const { rtl, files, header, hex, samples } = input;
  const vhdlFiles = { package: input.vhdlPackageFile, parts: files.vhdl, testbench: files.vhdlTestbench };
  const verilogFiles = { include: input.verilogIncludeFile, parts: files.verilog, testbench: files.verilogTestbench };
  const vhdl = RTL_PARTS.map((p) =>
    artifactFile(files.vhdl[p], 'text/x-vhdl', renderTemplate(`vhdl.${p}` as TemplateId, rtlVhdlView(rtl, header(files.vhdl[p]), vhdlFiles))),
  );
  const verilog = RTL_PARTS.map((p) =>
    artifactFile(files.verilog[p], 'text/x-verilog', renderTemplate(`verilog.${p}` as TemplateId, rtlVerilogView(rtl, header(files.verilog[p]), verilogFiles))),
  );
  return [
    ...vhdl,
    artifactFile(files.vhdlTestbench, 'text/x-vhdl', renderTemplate('vhdl.testbench', rtlTestbenchVhdlView(rtl, header(files.vhdlTestbench), vhdlFiles, hex, samples))),
    ...verilog,
    artifactFile(files.verilogTestbench, 'text/x-verilog', renderTemplate('verilog.testbench', rtlTestbenchVerilogView(rtl, header(files.verilogTestbench), verilogFiles, hex, samples))),
  ];
}
