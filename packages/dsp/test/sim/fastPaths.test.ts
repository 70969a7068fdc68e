/// <reference types="node" />
/**
 * The fast paths of the simulation give the same numbers as the paths they replace, bit for bit:
 * the WebAssembly run (bit-true kernel, float loop, conversion and accumulator core, wasmTraced.ts)
 * against the TypeScript one (record, checksum, traces, metrics) over seeded random specs, widths,
 * modes and scenarios. The TypeScript kernel itself is proved against
 * gcc-compiled C in test/vectors/cReference.test.ts and against the audit reference in test/audit.
 * And the chunked trace and metric accumulator against the per-sample one it replaced
 * (reference/perSampleAccumulator.ts), fed by the plain kernels sample by sample.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { planDesign, simulatePlan } from '../../src/planDesign.ts';
import { parseLoopSpec, type LoopSpec } from '../../src/spec/schema.ts';
import type { Scenario } from '../../src/spec/scenario.ts';
import type { SimResult } from '../../src/types/sim.ts';
import { initialBitTrueState, runBitTrueChunk } from '../../src/sim/bitTrueKernel.ts';
import { wasmBitTrueLoop, wasmKernelAvailable } from '../../src/sim/wasm/wasmKernel.ts';
import { BIT_TRUE_KERNEL_WASM_BASE64 } from '../../src/sim/wasm/kernelBytes.ts';
import { assembleKernel, kernelBytesModule, kernelBytesPath } from '../../scripts/assembleKernel.ts';
import { mainsSyncSpec } from '../../src/spec/examples.ts';
import { mulberry32, pick, randomLoopSpec, uniform } from '../reference/random.ts';
import { allocInputChunk, inputGenerator } from '../../src/sim/inputSignal.ts';
import { initialFloatState, runFloatChunk } from '../../src/sim/floatKernel.ts';
import { quantizeInput } from '../../src/sim/bitTrueKernel.ts';
import { bitTrueNcoHzOf, bitTrueRecordOf, CHUNK_SAMPLES } from '../../src/sim/simulate.ts';
import type { RunSetup } from '../../src/sim/runAccumulator.ts';
import { lockModel } from '../../src/sim/lockMetric.ts';
import type { DesignPlan } from '../../src/planDesign.ts';
import { PerSampleAccumulator } from './reference/perSampleAccumulator.ts';
import { tracedRunFits, wasmTraced } from '../../src/sim/wasm/wasmTraced.ts';
import { rippleBoxcarSamples } from '../../src/sim/rippleBoxcar.ts';

/** Whether simulatePlan runs this case in the module (wasmTraced.ts) rather than in TypeScript. */
function runsTraced(plan: DesignPlan, scenario: Scenario): boolean {
  const { sampleRateHz, centerHz } = plan.spec;
  const total = Math.round(scenario.durationS * sampleRateHz);
  return tracedRunFits(plan.filter.sections.length, rippleBoxcarSamples(sampleRateHz, centerHz, total));
}

/** A random spec of the cross-check generator with random widths and modes (valid, or null). */
function randomCase(rnd: () => number, index: number): { spec: LoopSpec; scenario: Scenario } | null {
  const base = randomLoopSpec(rnd, index);
  const dataBits = 6 + Math.floor(rnd() * 21);
  const coefficientBits = 12 + Math.floor(rnd() * 15);
  const macBits = Math.min(64, Math.max(dataBits, coefficientBits, dataBits + coefficientBits + Math.floor(uniform(rnd, -8, 30))));
  const accumulatorBits = 16 + Math.floor(rnd() * 49);
  const spec: LoopSpec = {
    ...base,
    nco: {
      ...base.nco,
      accumulatorBits,
      phaseBits: Math.min(4 + Math.floor(rnd() * 13), accumulatorBits),
      amplitudeBits: 4 + Math.floor(rnd() * 21),
      waveform: pick(rnd, ['sine', 'square'] as const),
    },
    fixedPoint: {
      ...base.fixedPoint,
      dataBits,
      coefficientBits,
      accumulatorBits: macBits,
      rounding: pick(rnd, ['nearest', 'half-even', 'truncate'] as const),
      overflow: pick(rnd, ['saturate', 'wrap'] as const),
    },
  };
  if (!parseLoopSpec(spec).ok) return null;
  const durationS = Math.floor(uniform(rnd, 2000, 20000)) / spec.sampleRateHz;
  const offsetHz = uniform(rnd, -0.05, 0.05) * spec.nco.gainHzPerUnit;
  const scenario: Scenario = pick(rnd, [
    { kind: 'tone', offsetHz, durationS, snrDb: uniform(rnd, 0, 60), seed: index + 1 },
    { kind: 'frequency-step', stepHz: offsetHz, atS: durationS / 3, durationS },
    { kind: 'phase-step', stepDeg: uniform(rnd, -180, 180), atS: durationS / 4, durationS, initialPhaseDeg: 30 },
  ]);
  return { spec, scenario };
}

describe('the WebAssembly bit-true kernel', () => {
  it('is the .wat as it stands, assembled by wabt', async () => {
    const bytes = await assembleKernel();
    expect(Buffer.from(bytes).toString('base64')).toBe(BIT_TRUE_KERNEL_WASM_BASE64);
    expect(readFileSync(kernelBytesPath(), 'utf8')).toBe(kernelBytesModule(bytes));
  });

  it('runs in Node (so the simulations below compare two different kernels)', () => {
    expect(wasmKernelAvailable()).toBe(true);
    expect(wasmBitTrueLoop(planDesign(parseLoopSpecOrThrow(mainsSyncSpec)).bitTrue!)).not.toBeNull();
  });

  it('writes the same per-sample outputs and checksum as the TypeScript kernel, chunk by chunk', () => {
    const plan = planDesign(parseLoopSpecOrThrow(mainsSyncSpec)).bitTrue!;
    const wasm = wasmBitTrueLoop(plan)!;
    const state = initialBitTrueState(plan);
    const rnd = mulberry32(7);
    for (const count of [1, 8192, 300]) {
      const input = Int32Array.from({ length: count }, () => Math.floor(uniform(rnd, -32768, 32768)));
      const out = { phaseHi: new Uint32Array(count), phaseLo: new Uint32Array(count), tableAddress: new Int32Array(count), ncoCode: new Int32Array(count), detectorCode: new Int32Array(count), filterCode: new Int32Array(count) };
      runBitTrueChunk(plan, state, input, count, out);
      wasm.run(input, count);
      for (const key of Object.keys(out) as (keyof typeof out)[]) expect(wasm.out[key].subarray(0, count)).toEqual(out[key]);
      expect(wasm.checksum).toBe(state.checksum);
    }
  });

  it('hosts the whole traced run of the mains-sync loop (float loop, kernel, accumulator cores)', () => {
    const plan = planDesign(parseLoopSpecOrThrow(mainsSyncSpec));
    const traced = wasmTraced(plan.bitTrue!, plan.filter.sections.length, rippleBoxcarSamples(10e3, 50, 1e6));
    expect(traced).not.toBeNull();
    traced!.release();
    expect(runsTraced(plan, { kind: 'tone', offsetHz: 1, durationS: 100 })).toBe(true);
  });

  it('gives the same record, checksum, traces and metrics as the TypeScript kernel on 40 random specs (seeded)', () => {
    const rnd = mulberry32(20261216);
    let compared = 0;
    let traced = 0;
    const sectionCounts = new Set<number>();
    const modes = new Set<string>();
    for (let i = 0; compared < 40 && i < 400; i++) {
      const c = randomCase(rnd, i);
      if (!c) continue;
      const parsed = parseLoopSpec(c.spec);
      if (!parsed.ok) continue;
      const plan = planDesign(parsed.spec);
      if (!plan.bitTrue) continue;
      const wasm = simulatePlan(plan, c.scenario, { keepRecord: true, bitTrueKernel: 'wasm' });
      const ts = simulatePlan(plan, c.scenario, { keepRecord: true, bitTrueKernel: 'typescript' });
      expect(wasm.bitTrue!.checksum).toBe(ts.bitTrue!.checksum);
      expect(sameRun(wasm, ts)).toBe(true);
      if (runsTraced(plan, c.scenario)) traced++;
      // The record-only path of the golden vectors keeps the same record (either kernel; every fourth case the TypeScript one).
      const loop = { spec: plan.spec, sections: plan.filter.sections, bitTrue: plan.bitTrue, bitTrueIssue: plan.bitTrueIssue };
      const only = bitTrueRecordOf(loop, c.scenario, compared % 4 === 0 ? 'typescript' : 'wasm');
      expect(only.checksum).toBe(ts.bitTrue!.checksum);
      expect(only.record).toEqual(ts.bitTrue!.record);
      sectionCounts.add(plan.bitTrue.sectionCount);
      modes.add(`${plan.bitTrue.rounding}/${plan.bitTrue.overflow}/${plan.bitTrue.waveform}/${plan.bitTrue.ncoAccumulatorBits > 32 ? 'wide' : 'narrow'}`);
      compared++;
    }
    expect(compared).toBe(40);
    // Nearly every case ran the module's traced path against the TypeScript one (a long ripple boxcar runs TypeScript).
    expect(traced).toBeGreaterThanOrEqual(30);
    // The cases cover one to four sections and most combinations of rounding, overflow, waveform and phase width.
    expect([...sectionCounts].sort()).toEqual([1, 2, 3, 4]);
    expect(modes.size).toBeGreaterThanOrEqual(14);
  });
});

/** The float and bit-true runs of simulatePlan, recomputed with the TypeScript kernel and the per-sample accumulator. */
function oracleRuns(plan: DesignPlan, scenario: Scenario, options: { buckets: number; fullTraces: boolean }) {
  const spec = plan.spec;
  const total = Math.round(scenario.durationS * spec.sampleRateHz);
  const setup: RunSetup = {
    total,
    buckets: options.buckets,
    sampleRateHz: spec.sampleRateHz,
    centerHz: spec.centerHz,
    gainHzPerUnit: spec.nco.gainHzPerUnit,
    amplitude: spec.input.amplitude,
    lockToleranceRad: 0.1,
    deviationHz: scenario.kind === 'fm' ? scenario.deviationHz : null,
    lockModel: lockModel({ spec, sections: plan.filter.sections }, scenario),
    fullTraces: options.fullTraces,
    sweepTurnSample: null,
  };
  const floatAcc = new PerSampleAccumulator(setup);
  const bitAcc = new PerSampleAccumulator(setup);
  const cfg = { sampleRateHz: spec.sampleRateHz, centerHz: spec.centerHz, gainHzPerUnit: spec.nco.gainHzPerUnit, waveform: spec.nco.waveform, sections: plan.filter.sections };
  const floatState = initialFloatState(cfg);
  const bt = plan.bitTrue!;
  const bitState = initialBitTrueState(bt);
  const ncoHzOf = bitTrueNcoHzOf(bt);
  const gen = inputGenerator(scenario, spec.sampleRateHz, spec.centerHz, spec.input.amplitude);
  const input = allocInputChunk(CHUNK_SAMPLES);
  const fl = { ncoPhaseCycles: new Float64Array(CHUNK_SAMPLES), filterOutput: new Float64Array(CHUNK_SAMPLES) };
  const codes = new Int32Array(CHUNK_SAMPLES);
  const rec = { phaseHi: new Uint32Array(CHUNK_SAMPLES), phaseLo: new Uint32Array(CHUNK_SAMPLES), tableAddress: new Int32Array(CHUNK_SAMPLES), ncoCode: new Int32Array(CHUNK_SAMPLES), detectorCode: new Int32Array(CHUNK_SAMPLES), filterCode: new Int32Array(CHUNK_SAMPLES) };
  for (let n0 = 0; n0 < total; n0 += CHUNK_SAMPLES) {
    const count = Math.min(CHUNK_SAMPLES, total - n0);
    gen.next(input, n0, count);
    runFloatChunk(cfg, floatState, input.x, count, fl);
    quantizeInput(bt, input.x, count, codes);
    runBitTrueChunk(bt, bitState, codes, count, rec);
    for (let i = 0; i < count; i++) {
      const y = fl.filterOutput[i]!;
      floatAcc.push(n0 + i, input.phaseCycles[i]!, fl.ncoPhaseCycles[i]!, input.x[i]!, y, cfg.centerHz + cfg.gainHzPerUnit * y, input.offsetHz[i]!);
      const phase = rec.phaseHi[i]! * 2 ** (32 - bt.ncoAccumulatorBits) + rec.phaseLo[i]! * 2 ** -bt.ncoAccumulatorBits;
      const code = rec.filterCode[i]!;
      bitAcc.push(n0 + i, input.phaseCycles[i]!, phase, input.x[i]!, code * 2 ** -(bt.dataBits - 1), ncoHzOf(code), input.offsetHz[i]!);
    }
  }
  return { float: floatAcc.finish(), bitTrue: { ...bitAcc.finish(), checksum: bitState.checksum } };
}

/**
 * Every number of two results identical (typed arrays compared as bytes: toStrictEqual walks them
 * element by element, which for 40 runs takes longer than the runs).
 */
function sameRun(a: SimResult, b: SimResult): boolean {
  const bytes = (v: ArrayBufferView) => Buffer.from(v.buffer, v.byteOffset, v.byteLength);
  const same = (x: unknown, y: unknown): boolean => {
    if (ArrayBuffer.isView(x) && ArrayBuffer.isView(y)) return x.constructor === y.constructor && bytes(x).equals(bytes(y));
    if (typeof x !== 'object' || x === null || typeof y !== 'object' || y === null) return Object.is(x, y);
    const kx = Object.keys(x);
    const ky = Object.keys(y);
    return kx.length === ky.length && kx.every((k) => same((x as Record<string, unknown>)[k], (y as Record<string, unknown>)[k]));
  };
  return same(a, b);
}

describe('the chunked trace and metric accumulator', () => {
  it('gives the same traces and metrics as the per-sample one on 24 random specs and scenarios (seeded)', () => {
    const rnd = mulberry32(20261217);
    let compared = 0;
    let traced = 0;
    for (let i = 0; compared < 24 && i < 300; i++) {
      const c = randomCase(rnd, i);
      if (!c) continue;
      const parsed = parseLoopSpec(c.spec);
      if (!parsed.ok) continue;
      const plan = planDesign(parsed.spec);
      if (!plan.bitTrue) continue;
      // Bucket counts that do and do not divide the run, one that exceeds it, and full traces.
      const buckets = pick(rnd, [1, 7, 1000, 4096, 50_000]);
      const fullTraces = rnd() < 0.3;
      const fast = simulatePlan(plan, c.scenario, { buckets, fullTraces });
      if (runsTraced(plan, c.scenario)) traced++;
      const oracle = oracleRuns(plan, c.scenario, { buckets, fullTraces });
      expect(sameRun(fast.float as never, oracle.float as never)).toBe(true);
      expect(sameRun(fast.bitTrue as never, oracle.bitTrue as never)).toBe(true);
      compared++;
    }
    expect(compared).toBe(24);
    expect(traced).toBeGreaterThanOrEqual(18);
  });

  it('is compared by a check that sees one changed bit', () => {
    const plan = planDesign(parseLoopSpecOrThrow(mainsSyncSpec));
    const sc: Scenario = { kind: 'tone', offsetHz: 1, durationS: 0.5 };
    const a = simulatePlan(plan, sc);
    const b = simulatePlan(plan, sc);
    expect(sameRun(a, b)).toBe(true);
    const bits = new Float64Array([b.float!.traces.lockIndicator.max[3]!]);
    new Uint8Array(bits.buffer)[0]! ^= 1;
    (b.float!.traces.lockIndicator.max as Float64Array)[3] = bits[0]!;
    expect(sameRun(a, b)).toBe(false);
  });
});

function parseLoopSpecOrThrow(spec: LoopSpec) {
  const r = parseLoopSpec(spec);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.spec;
}
