/** The reference-RTL files of a rendered release folder, found from its manifest.json. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { artifactNames, MANIFEST_FILE, type Manifest } from '../render/artifacts.ts';
import { RTL_PARTS } from '../render/rtl.ts';

export interface RtlFolder {
  readonly dir: string;
  readonly design: string;
  /** Golden-vector samples of the release. */
  readonly samples: number;
  /** What the testbenches replay by default: the manifest's referenceRtl.testbenchSamples (releases before it replayed all). */
  readonly replaySamples: number;
  readonly vhdlFiles: readonly string[];
  readonly verilogFiles: readonly string[];
  readonly vhdlTestbench: string;
  readonly verilogTestbench: string;
  readonly verilogInclude: string;
  readonly loopEntity: string;
  readonly testbenchEntity: string;
}

export class RtlFolderError extends Error {
  override readonly name = 'RtlFolderError';
}

export function rtlFolder(dir: string): RtlFolder {
  let manifest: Manifest;
  try {
    manifest = JSON.parse(readFileSync(join(dir, MANIFEST_FILE), 'utf8')) as Manifest;
  } catch (err) {
    throw new RtlFolderError(`${dir} holds no readable ${MANIFEST_FILE} (${(err as NodeJS.ErrnoException).code ?? (err as Error).message}): give the folder of a rendered release`);
  }
  const names = artifactNames(manifest.design);
  const vectors = (manifest.results as { vectors?: { samples?: unknown } }).vectors;
  if (typeof vectors?.samples !== 'number') throw new RtlFolderError(`${MANIFEST_FILE} of ${dir} names no golden-vector sample count (results.vectors.samples)`);
  const replay = (manifest.results as { referenceRtl?: { testbenchSamples?: unknown } }).referenceRtl?.testbenchSamples;
  return {
    dir,
    design: manifest.design,
    samples: vectors.samples,
    replaySamples: typeof replay === 'number' ? replay : vectors.samples,
    vhdlFiles: [names.vhdl, ...RTL_PARTS.map((p) => names.rtl.vhdl[p])],
    verilogFiles: RTL_PARTS.map((p) => names.rtl.verilog[p]),
    vhdlTestbench: names.rtl.vhdlTestbench,
    verilogTestbench: names.rtl.verilogTestbench,
    verilogInclude: names.verilog,
    loopEntity: `${manifest.design}_loop`,
    testbenchEntity: `${manifest.design}_loop_tb`,
  };
}
