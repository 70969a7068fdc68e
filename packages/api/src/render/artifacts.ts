/**
 * Renders every artifact of a release from the server's computed results. One function serves the
 * release service and the CLI's `render`, so a release and `loopwright render` hold the same bytes.
 * Deterministic: no dates or release numbers inside the files (those live on the release record).
 */
import type { LoopSpec } from '@loopwright/dsp';
import { CAUTION, CAUTION_SHORT } from './caution.ts';
import { canonicalJson, sha256Hex } from './digest.ts';
import type { ReleaseComputation } from './compute.ts';
import { handoffModel } from './fromDsp.ts';
import type { HandoffModel } from './handoff.ts';
import { codeNames } from './identifiers.ts';
import { renderTemplate } from './templates.ts';
import { toolVersions, type ToolVersions } from './versions.ts';
import { cHeaderView } from './views/cHeader.ts';
import type { ArtifactHeader } from './views/header.ts';
import { readmeView } from './views/readme.ts';
import { artifactFile as file, type ArtifactFile } from './artifactFile.ts';
import { rtlFileNames, rtlModel } from './rtl.ts';
import { renderRtl, rtlPurposes } from './rtlArtifacts.ts';
import { verilogView } from './views/verilog.ts';
import { vhdlView } from './views/vhdl.ts';

export const MANIFEST_FILE = 'manifest.json';

export type { ArtifactFile } from './artifactFile.ts';

export interface ManifestConstant {
  readonly name: string;
  readonly label: string;
  readonly signedness: 'signed' | 'unsigned';
  readonly widthBits: number;
  /** Decimal integer code (a string: 64-bit codes do not survive a JSON number). */
  readonly code: string;
}

/**
 * Which release a manifest belongs to, set when the release is cut (the number is taken then): so two
 * releases of one spec differ in their manifest, and its SHA-256 tells them apart. Null for the files
 * `loopwright render` writes, which belong to no release.
 */
export interface ManifestRelease {
  readonly project: string;
  /** The design's title, as people name it (the identifier is `design`). */
  readonly designTitle: string;
  /** v1, v2, … */
  readonly label: string;
  /** ISO 8601, UTC. */
  readonly cutAt: string;
}

export interface Manifest {
  readonly manifestVersion: 1;
  /** The spec `name`: the identifier of the generated code. */
  readonly design: string;
  readonly release: ManifestRelease | null;
  readonly versions: ToolVersions;
  readonly specSha256: string;
  readonly spec: LoopSpec;
  readonly results: Readonly<Record<string, unknown>>;
  /** Word formats the files declare (VHDL subtypes, C typedefs). */
  readonly types: readonly { name: string; label: string; signedness: 'signed' | 'unsigned'; widthBits: number; format: string }[];
  readonly constants: readonly ManifestConstant[];
  readonly counts: readonly { name: string; label: string; unit: string; value: number }[];
  /** ROMs (the sine table), every entry as a plain integer code. */
  readonly tables: readonly { name: string; label: string; signedness: 'signed'; widthBits: number; codes: readonly number[] }[];
  readonly files: readonly { name: string; bytes: number; sha256: string }[];
  readonly caution: string;
}

export interface RenderedRelease {
  /** manifest.json first, then the files it lists. */
  readonly files: readonly ArtifactFile[];
  readonly manifest: Manifest;
  readonly manifestSha256: string;
  readonly specSha256: string;
}

export function artifactNames(name: string) {
  codeNames(name);
  return {
    vhdl: `${name}_pkg.vhd`,
    verilog: `${name}.vh`,
    cHeader: `${name}.h`,
    vectors: `${name}_vectors.csv`,
    readme: 'README.txt',
    rtl: rtlFileNames(name),
  } as const;
}

export function specDigest(spec: LoopSpec): string {
  return sha256Hex(canonicalJson(spec));
}

/** The banner of every generated code file of a spec's release, by file name. */
export function artifactHeaders(spec: LoopSpec): (fileName: string) => ArtifactHeader {
  const versions = toolVersions();
  const specSha256 = specDigest(spec);
  return (fileName) => ({ fileName, designName: spec.name, toolVersion: versions.loopwright, specSha256, caution: CAUTION_SHORT });
}

export function renderArtifacts(computation: ReleaseComputation): RenderedRelease {
  const { plan } = computation;
  const { spec } = plan;
  const versions = toolVersions();
  const specSha256 = specDigest(spec);
  const model = handoffModel(plan);
  const names = artifactNames(spec.name);
  const header = artifactHeaders(spec);
  const purposes = [
    { name: names.vhdl, purpose: `VHDL-2008 package ${codeNames(spec.name).vhdlPackage} (ieee.numeric_std)` },
    { name: names.verilog, purpose: 'Verilog localparams, to `include inside a module body' },
    { name: names.cHeader, purpose: 'C11 header of macros typed by <stdint.h>' },
    { name: names.vectors, purpose: 'golden vectors, bit-true, CSV' },
    ...computation.vectorHex.map((h) => ({ name: h.fileName, purpose: `golden column ${h.column} as a $readmemh file (${h.widthBits}-bit words, ${h.digits} hex digits a line)` })),
    ...rtlPurposes(names.rtl),
  ];
  const rtl = rtlModel(spec.name, plan.bitTrue);
  const samples = plan.goldenVectors.record.length;
  const files: ArtifactFile[] = [
    file(names.vhdl, 'text/x-vhdl', renderTemplate('vhdl', vhdlView(model, header(names.vhdl)))),
    file(names.verilog, 'text/x-verilog', renderTemplate('verilog', verilogView(model, header(names.verilog)))),
    file(names.cHeader, 'text/x-c', renderTemplate('cHeader', cHeaderView(model, header(names.cHeader)))),
    file(names.vectors, 'text/csv', computation.vectorsCsv),
    ...computation.vectorHex.map((h) => file(h.fileName, 'text/plain', h.bytes)),
    ...renderRtl({
      rtl,
      files: names.rtl,
      vhdlPackageFile: names.vhdl,
      verilogIncludeFile: names.verilog,
      hex: computation.vectorHex,
      samples,
      header,
    }),
    file(
      names.readme,
      'text/plain',
      renderTemplate(
        'readme',
        readmeView({
          spec,
          quantized: plan.quantized,
          bitTrue: plan.bitTrue,
          model,
          toolVersion: versions.loopwright,
          specSha256,
          files: [...purposes, { name: names.readme, purpose: 'this file' }],
          vectorsFile: names.vectors,
          vectorColumns: computation.vectorColumns,
          rtl,
          rtlFiles: { vhdlPackage: names.vhdl, ...names.rtl },
          samples,
        }),
      ),
    ),
  ];
  return withManifest(buildManifest(computation, model, versions, specSha256, files), files, specSha256);
}

function withManifest(manifest: Manifest, files: readonly ArtifactFile[], specSha256: string): RenderedRelease {
  const manifestFile = file(MANIFEST_FILE, 'application/json', `${canonicalJson(manifest, 2)}\n`);
  return { files: [manifestFile, ...files], manifest, manifestSha256: manifestFile.sha256, specSha256 };
}

/** The render as the release `release` holds it: its manifest names project, design, label and cut time. */
export function stampRelease(rendered: RenderedRelease, release: ManifestRelease): RenderedRelease {
  return withManifest({ ...rendered.manifest, release }, rendered.files.filter((f) => f.name !== MANIFEST_FILE), rendered.specSha256);
}

function buildManifest(
  computation: ReleaseComputation,
  model: HandoffModel,
  versions: ToolVersions,
  specSha256: string,
  files: readonly ArtifactFile[],
): Manifest {
  const names = codeNames(model.name);
  return {
    manifestVersion: 1,
    design: model.name,
    release: null,
    versions,
    specSha256,
    spec: computation.plan.spec,
    results: computation.results,
    types: model.types.map((t) => ({ name: names.typeName(t.suffix), label: t.label, signedness: t.signedness, widthBits: t.widthBits, format: t.format })),
    constants: model.codes.map((c) => ({
      name: names.constant(c.suffix),
      label: c.label,
      signedness: c.signedness,
      widthBits: c.widthBits,
      code: c.code.toString(),
    })),
    counts: model.counts.map((c) => ({ name: names.constant(c.suffix), label: c.label, unit: c.unit, value: c.value })),
    tables: model.tables.map((t) => ({ name: names.constant(t.suffix), label: t.label, signedness: t.signedness, widthBits: t.widthBits, codes: t.codes })),
    files: files.map((f) => ({ name: f.name, bytes: f.bytes.length, sha256: f.sha256 })),
    caution: CAUTION,
  };
}

