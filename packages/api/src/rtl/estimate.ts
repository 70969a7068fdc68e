/**
 * Resource estimate of the reference RTL with Debian's yosys: the Verilog loop synthesised for a
 * generic 4-input-LUT fabric (`synth -lut 4`) and for an iCE40 UltraPlus (`synth_ice40 -dsp`), with
 * the hierarchy kept so each part of the loop (NCO, detector, each section, the top's own logic) is
 * counted on its own. Multipliers and ROM bits are counted before technology mapping (yosys's $mul and
 * $mem cells). An estimate for a small FPGA, not a vendor fit: no timing, placement or packing.
 * When yosys is missing the answer is "not estimated", never a figure of our own.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { GenericResources, Ice40Resources, ResourceEstimate, ResourcePart } from '@loopwright/contract';
import { runProcess, toolVersion } from './processes.ts';

export const ESTIMATE_LABEL =
  'Estimate for a generic small FPGA (yosys synth -lut 4, and synth_ice40 -dsp for an iCE40 UltraPlus): LUT, flip-flop, multiplier and ROM counts before place and route, not a vendor fit or a timing result.';

export interface VerilogSources {
  /** File name -> text: the RTL modules and the include they read. */
  readonly files: ReadonlyMap<string, string>;
  /** Module files in compile order (the include is found by `include). */
  readonly modules: readonly string[];
  readonly top: string;
}

export interface EstimateOptions {
  readonly timeoutMs?: number;
  readonly env?: NodeJS.ProcessEnv;
}

type Json = { modules: Record<string, { attributes?: Record<string, string>; cells: Record<string, { type: string; parameters: Record<string, string> }> }> };

/** A cell that instantiates one of our modules (the cell library's modules are blackboxes: leaves). */
function isInstance(json: Json, type: string): boolean {
  const m = json.modules[type];
  return m !== undefined && m.attributes?.blackbox === undefined;
}

/** yosys writes integer parameters as binary strings. */
function parameterValue(text: string | undefined): number {
  return text === undefined ? 0 : parseInt(text, 2);
}

type Counter = (cell: { type: string; parameters: Record<string, string> }) => Partial<Record<string, number>>;

/** Leaf-cell tallies of a module, its submodule instances included, by a counter of each cell. */
function tally(json: Json, module: string, counter: Counter, seen: Map<string, Record<string, number>> = new Map()): Record<string, number> {
  const cached = seen.get(module);
  if (cached) return cached;
  const out: Record<string, number> = {};
  for (const cell of Object.values(json.modules[module]?.cells ?? {})) {
    const parts = isInstance(json, cell.type) ? tally(json, cell.type, counter, seen) : counter(cell);
    for (const [k, v] of Object.entries(parts)) out[k] = (out[k] ?? 0) + (v ?? 0);
  }
  seen.set(module, out);
  return out;
}

const coarseCounter: Counter = (c) => {
  if (c.type === '$mul') return { multipliers: 1 };
  if (c.type.startsWith('$mem')) return { romBits: parameterValue(c.parameters.WIDTH) * parameterValue(c.parameters.SIZE) };
  return {};
};
const genericCounter: Counter = (c) => (c.type === '$lut' ? { luts: 1 } : /^\$_.*(DFF|DLATCH)/.test(c.type) ? { flipFlops: 1 } : {});
const ice40Counter: Counter = (c) => {
  if (c.type === 'SB_LUT4') return { luts: 1 };
  if (c.type.startsWith('SB_DFF')) return { flipFlops: 1 };
  if (c.type === 'SB_CARRY') return { carries: 1 };
  if (c.type === 'SB_MAC16') return { dspBlocks: 1 };
  if (c.type.startsWith('SB_RAM40')) return { ramBlocks: 1 };
  return {};
};

/** The top's own cells (not in any instance) under a counter. */
function ownTally(json: Json, top: string, counter: Counter): Record<string, number> {
  const out: Record<string, number> = {};
  for (const cell of Object.values(json.modules[top]?.cells ?? {})) {
    if (isInstance(json, cell.type)) continue;
    for (const [k, v] of Object.entries(counter(cell))) out[k] = (out[k] ?? 0) + (v ?? 0);
  }
  return out;
}

function instances(json: Json, top: string): { instance: string; module: string }[] {
  return Object.entries(json.modules[top]?.cells ?? {})
    .filter(([, c]) => isInstance(json, c.type))
    .map(([instance, c]) => ({ instance, module: c.type }))
    .sort((a, b) => a.instance.localeCompare(b.instance, 'en', { numeric: true }));
}

function partName(instance: string): string {
  const section = /^u_section(\d+)$/.exec(instance);
  if (section) return `section ${section[1]}`;
  return instance.replace(/^u_/, '');
}

function generic(pre: Record<string, number>, fine: Record<string, number>): GenericResources {
  return { luts: fine.luts ?? 0, flipFlops: fine.flipFlops ?? 0, multipliers: pre.multipliers ?? 0, romBits: pre.romBits ?? 0 };
}
function ice40(t: Record<string, number>): Ice40Resources {
  return { luts: t.luts ?? 0, flipFlops: t.flipFlops ?? 0, carries: t.carries ?? 0, dspBlocks: t.dspBlocks ?? 0, ramBlocks: t.ramBlocks ?? 0 };
}

/** Per part and in total, from yosys's three netlists (before mapping, generic LUTs, iCE40). */
export function resourceParts(top: string, pre: Json, fine: Json, ice: Json): { parts: ResourcePart[]; total: { generic: GenericResources; ice40: Ice40Resources } } {
  // The three netlists share instance names; their module names differ (yosys derives them per run).
  const find = (json: Json, instance: string) => instances(json, top).find((i) => i.instance === instance)?.module ?? '';
  const parts: ResourcePart[] = instances(pre, top).map(({ instance, module }) => ({
    part: partName(instance),
    instance,
    generic: generic(tally(pre, module, coarseCounter), tally(fine, find(fine, instance), genericCounter)),
    ice40: ice40(tally(ice, find(ice, instance), ice40Counter)),
  }));
  parts.push({ part: 'top', instance: top, generic: generic(ownTally(pre, top, coarseCounter), ownTally(fine, top, genericCounter)), ice40: ice40(ownTally(ice, top, ice40Counter)) });
  return { parts, total: { generic: generic(tally(pre, top, coarseCounter), tally(fine, top, genericCounter)), ice40: ice40(tally(ice, top, ice40Counter)) } };
}

const DEFAULT_TIMEOUT_MS = 300_000;

/** Synthesise the sources twice (generic and iCE40, in parallel) and count resources per part. */
export async function estimateResources(sources: VerilogSources, options: EstimateOptions = {}): Promise<ResourceEstimate> {
  const version = await toolVersion('yosys', '-V', options.env);
  if (version === null) return { state: 'not-estimated', reason: 'yosys is not installed' };
  const dir = mkdtempSync(join(tmpdir(), 'lw-estimate-'));
  try {
    for (const [name, text] of sources.files) writeFileSync(join(dir, name), text);
    const read = `read_verilog -I${dir} ${sources.modules.join(' ')}`;
    const run = (script: string) =>
      runProcess('yosys', ['-q', '-p', script], { cwd: dir, timeoutMs: options.timeoutMs ?? DEFAULT_TIMEOUT_MS, ...(options.env ? { env: options.env } : {}) });
    const started = performance.now();
    const [generic, ice] = await Promise.all([
      run(`${read}; hierarchy -top ${sources.top}; proc; opt -fast; memory -nomap; write_json pre.json; synth -top ${sources.top} -lut 4; write_json generic.json`),
      run(`${read}; synth_ice40 -dsp -noflatten -top ${sources.top}; write_json ice40.json`),
    ]);
    for (const r of [generic, ice]) {
      if (r.missing) return { state: 'not-estimated', reason: 'yosys is not installed' };
      if (r.timedOut) return { state: 'not-estimated', reason: `yosys did not finish within ${options.timeoutMs ?? DEFAULT_TIMEOUT_MS} ms` };
      if (r.code !== 0) return { state: 'not-estimated', reason: `yosys failed (exit ${r.code}): ${`${r.stdout}${r.stderr}`.trim().split('\n').slice(-3).join(' ')}` };
    }
    const json = (name: string) => JSON.parse(readFileSync(join(dir, name), 'utf8')) as Json;
    const { parts, total } = resourceParts(sources.top, json('pre.json'), json('generic.json'), json('ice40.json'));
    return { state: 'estimated', tool: version, label: ESTIMATE_LABEL, parts, total, durationMs: Math.round(performance.now() - started) };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
