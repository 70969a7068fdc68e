/**
 * The terminal commands. Each returns the text for stdout; every bad input is a UsageError (one line,
 * naming the field) that main.ts prints to stderr with exit code 2.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { measurePlanAcquisition, tryPlanDesign } from '@loopwright/dsp';
import { renderArtifacts } from '../render/artifacts.ts';
import { computeDesign, computeRelease, RenderInputError } from '../render/compute.ts';
import { synthesisSources } from '../render/synthesisSources.ts';
import { estimateResources } from '../rtl/estimate.ts';
import { RtlFolderError } from '../rtl/releaseFolder.ts';
import { verifyFolder } from '../rtl/verify.ts';
import { simulateScenario } from '../render/simulation.ts';
import { issuesLine, readJsonFile, resolveUserPath, UsageError } from './input.ts';

export interface CommandOutput {
  readonly stdout: string;
  readonly exitCode: number;
}

export function toJson(value: unknown): string {
  return `${JSON.stringify(value, (_k, v: unknown) => (typeof v === 'bigint' ? v.toString() : v), 2)}\n`;
}

export function designCommand(specPath: string): string {
  const r = tryPlanDesign(readJsonFile('SPEC.json', specPath));
  if (!r.ok) throw new UsageError(issuesLine('SPEC.json', r.issues));
  return toJson(r.plan.analysis);
}

/** Each acquisition figure as estimate (the analysis's formula) and measured (the nonlinear loop simulated). */
export function acquireCommand(specPath: string): string {
  const r = tryPlanDesign(readJsonFile('SPEC.json', specPath));
  if (!r.ok) throw new UsageError(issuesLine('SPEC.json', r.issues));
  return toJson({ specName: r.plan.spec.name, ...measurePlanAcquisition(r.plan) });
}

export function simulateCommand(specPath: string, scenarioPath: string, vectors: number | undefined): string {
  const spec = readJsonFile('SPEC.json', specPath);
  const scenario = readJsonFile('SCENARIO.json', scenarioPath);
  const r = simulateScenario(spec, scenario, vectors);
  if (!r.ok) throw new UsageError(issuesLine(r.label, r.issues));
  return vectors === undefined ? toJson(r.output.metrics) : r.output.vectorsCsv;
}

/** Writes exactly the files a release of the spec holds (manifest.json included); prints their sums. */
export function renderCommand(specPath: string, outDir: string): string {
  const computed = computeRelease(readJsonFile('SPEC.json', specPath));
  if (!computed.ok) throw new UsageError(issuesLine('SPEC.json', computed.issues));
  let rendered;
  try {
    rendered = renderArtifacts(computed.release);
  } catch (err) {
    if (err instanceof RenderInputError) throw new UsageError(issuesLine('SPEC.json', [{ field: err.field, message: err.message }]));
    throw err;
  }
  const dir = resolveUserPath(outDir);
  try {
    mkdirSync(dir, { recursive: true });
    for (const f of rendered.files) writeFileSync(join(dir, f.name), f.bytes);
  } catch (err) {
    throw new UsageError(`OUTDIR: cannot write to ${dir} (${(err as NodeJS.ErrnoException).code ?? String(err)})`);
  }
  return toJson({
    outDir: dir,
    manifestSha256: rendered.manifestSha256,
    files: rendered.files.map((f) => ({ name: f.name, bytes: f.bytes.length, sha256: f.sha256 })),
  });
}

/** verify's exit codes: 0 every installed simulator passed, 1 a FAIL or no verdict, 3 nothing verified. */
const VERIFY_EXIT = { passed: 0, partial: 0, failed: 1, 'not-run': 3 } as const;

/** Runs the testbenches of a rendered release folder with whichever simulators are installed. */
export async function verifyCommand(outDir: string, samples: number | undefined): Promise<CommandOutput> {
  const dir = resolveUserPath(outDir);
  try {
    const v = await verifyFolder(dir, samples === undefined ? {} : { samples });
    return { stdout: toJson(v), exitCode: VERIFY_EXIT[v.verdict] };
  } catch (err) {
    if (err instanceof RtlFolderError) throw new UsageError(`OUTDIR: ${err.message}`);
    throw err;
  }
}

/** The yosys resource estimate of the spec's reference RTL, or "not estimated". */
export async function estimateCommand(specPath: string): Promise<CommandOutput> {
  const computed = computeDesign(readJsonFile('SPEC.json', specPath));
  if (!computed.ok) throw new UsageError(issuesLine('SPEC.json', computed.issues));
  const sources = synthesisSources(computed.plan);
  return { stdout: toJson(await estimateResources(sources)), exitCode: 0 };
}
