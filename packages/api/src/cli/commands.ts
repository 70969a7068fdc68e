/**
 * The terminal commands. Each returns the text for stdout; every bad input is a UsageError (one line,
 * naming the field) that main.ts prints to stderr with exit code 2.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { tryAnalyzeDesign } from '@loopwright/dsp';
import { renderArtifacts } from '../render/artifacts.ts';
import { computeRelease, RenderInputError } from '../render/compute.ts';
import { simulateScenario, ScenarioInputError } from '../render/simulation.ts';
import { issuesLine, readJsonFile, resolveUserPath, UsageError } from './input.ts';

export function toJson(value: unknown): string {
  return `${JSON.stringify(value, (_k, v: unknown) => (typeof v === 'bigint' ? v.toString() : v), 2)}\n`;
}

export function designCommand(specPath: string): string {
  const r = tryAnalyzeDesign(readJsonFile('SPEC.json', specPath));
  if (!r.ok) throw new UsageError(issuesLine('SPEC.json', r.issues));
  return toJson(r.result);
}

export function simulateCommand(specPath: string, scenarioPath: string, vectors: number | undefined): string {
  const spec = readJsonFile('SPEC.json', specPath);
  const scenario = readJsonFile('SCENARIO.json', scenarioPath);
  try {
    const out = simulateScenario(spec, scenario, vectors);
    return vectors === undefined ? toJson(out.metrics) : out.vectorsCsv;
  } catch (err) {
    if (err instanceof ScenarioInputError) throw new UsageError(issuesLine(err.label, err.issues));
    throw err;
  }
}

/** Writes exactly the files a release of the spec holds (manifest.json included); prints their sums. */
export function renderCommand(specPath: string, outDir: string): string {
  const spec = readJsonFile('SPEC.json', specPath);
  let rendered;
  try {
    rendered = renderArtifacts(computeRelease(spec));
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
