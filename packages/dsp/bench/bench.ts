/// <reference types="node" />
/**
 * dsp benchmark (not a test; no timing is asserted anywhere): bit-true loop throughput — the
 * WebAssembly kernel the simulation runs and the TypeScript one — against the same loop in plain C
 * (bench/loop.c, gcc -O2), with equal checksums so all did the same work; the traced simulation
 * (float + bit-true, traces, metrics) per sample against the C kernel; analyzeDesign time. Run: node --import tsx bench/bench.ts
 * (prints JSON). The root bench imports runDspBench().
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { mainsSyncSpec, exampleSpecs } from '../src/spec/examples.ts';
import type { LoopSpec } from '../src/spec/schema.ts';
import type { Scenario } from '../src/spec/scenario.ts';
import type { BitTrueKernelChoice, BitTruePlan } from '../src/types/sim.ts';
import { wasmBitTrueLoop } from '../src/sim/wasm/wasmKernel.ts';
import { allocInputChunk, inputGenerator } from '../src/sim/inputSignal.ts';
import { initialBitTrueState, quantizeInput, runBitTrueChunk } from '../src/sim/bitTrueKernel.ts';
import { CHUNK_SAMPLES } from '../src/sim/simulate.ts';
import { planDesign, simulatePlan } from '../src/planDesign.ts';
import { requireValidSpec } from '../src/spec/schema.ts';
import { measureAcquisition } from '../src/analysis/acquisitionSim.ts';
import { defaultGoldenScenario, GOLDEN_VECTOR_SAMPLES, goldenVectorsOf, releaseGoldenVectors } from '../src/vectors/goldenVectors.ts';
import { formatVectorsCsv } from '../src/vectors/vectorsCsv.ts';
import { formatCParams } from './cParams.ts';
import { median, runAnalysisBench, runWordLengthBench } from './analysis.ts';

const HERE = path.dirname(fileURLToPath(import.meta.url));
const SAMPLES = 4_000_000;
const REPEATS = 7;

/** Input codes for the benchmark: a noisy FM input, quantised as the bit-true simulation does. */
function inputCodes(spec: LoopSpec, plan: BitTruePlan, samples: number): Int32Array {
  const sc: Scenario = { kind: 'fm', modulation: 'sine', rateHz: 1, deviationHz: 2, durationS: samples / spec.sampleRateHz, snrDb: 30, seed: 11 };
  const gen = inputGenerator(sc, spec.sampleRateHz, spec.centerHz, spec.input.amplitude);
  const chunk = allocInputChunk(CHUNK_SAMPLES);
  const codes = new Int32Array(samples);
  for (let n0 = 0; n0 < samples; n0 += CHUNK_SAMPLES) {
    const count = Math.min(CHUNK_SAMPLES, samples - n0);
    gen.next(chunk, n0, count);
    quantizeInput(plan, chunk.x, count, codes.subarray(n0, n0 + count));
  }
  return codes;
}

/** Wall-clock and process CPU time in ms (CPU time leaves out the time other processes had the core). */
function clocks(): { wallMs: number; cpuMs: number } {
  const u = process.cpuUsage();
  return { wallMs: performance.now(), cpuMs: (u.user + u.system) / 1000 };
}

export interface Pass {
  readonly seconds: number;
  readonly cpuSeconds: number;
  readonly checksum: number;
}

function timed(work: () => number): Pass {
  const t0 = clocks();
  const checksum = work();
  const t1 = clocks();
  return { seconds: (t1.wallMs - t0.wallMs) / 1000, cpuSeconds: (t1.cpuMs - t0.cpuMs) / 1000, checksum };
}

/** The TypeScript bit-true loop over all codes, chunk by chunk; it keeps the record checksum as loop.c does. */
function runTs(plan: BitTruePlan, codes: Int32Array): Pass {
  const state = initialBitTrueState(plan);
  const out = {
    phaseHi: new Uint32Array(CHUNK_SAMPLES),
    phaseLo: new Uint32Array(CHUNK_SAMPLES),
    tableAddress: new Int32Array(CHUNK_SAMPLES),
    ncoCode: new Int32Array(CHUNK_SAMPLES),
    detectorCode: new Int32Array(CHUNK_SAMPLES),
    filterCode: new Int32Array(CHUNK_SAMPLES),
  };
  return timed(() => {
    for (let n0 = 0; n0 < codes.length; n0 += CHUNK_SAMPLES) {
      const count = Math.min(CHUNK_SAMPLES, codes.length - n0);
      runBitTrueChunk(plan, state, codes.subarray(n0, n0 + count), count, out);
    }
    return state.checksum;
  });
}

/** The WebAssembly bit-true loop (the one simulations and golden vectors run), the record written per chunk as above. */
function runWasm(plan: BitTruePlan, codes: Int32Array): Pass {
  const loop = wasmBitTrueLoop(plan);
  if (!loop) throw new Error('WebAssembly is not available to the benchmark');
  return timed(() => {
    for (let n0 = 0; n0 < codes.length; n0 += CHUNK_SAMPLES) {
      const count = Math.min(CHUNK_SAMPLES, codes.length - n0);
      loop.run(codes.subarray(n0, n0 + count), count);
    }
    return loop.checksum;
  });
}

/** Compile loop.c once; returns a runner that times one pass (best of `repeats` inside the C program). */
function prepareC(plan: BitTruePlan, codes: Int32Array): { run: (repeats: number) => Pass; compiler: string; cleanup: () => void } {
  const dir = mkdtempSync(path.join(tmpdir(), 'loopwright-bench-'));
  const exe = path.join(dir, 'loop');
  execFileSync('gcc', ['-O2', '-o', exe, path.join(HERE, 'loop.c')]);
  const params = path.join(dir, 'params.txt');
  const input = path.join(dir, 'input.bin');
  writeFileSync(params, formatCParams(plan));
  writeFileSync(input, Buffer.from(codes.buffer, codes.byteOffset, codes.byteLength));
  const compiler = execFileSync('gcc', ['--version'], { encoding: 'utf8' }).split('\n')[0] ?? 'gcc';
  return {
    run: (repeats) => JSON.parse(execFileSync(exe, [params, input, String(repeats)], { encoding: 'utf8' })) as Pass,
    compiler,
    cleanup: () => rmSync(dir, { recursive: true, force: true }),
  };
}

/**
 * The C build of the mains-sync loop over the bench's noisy FM codes, for a bench elsewhere that
 * measures against it pass by pass (the API's split simulation, packages/api/bench/split-sim-bench.ts).
 */
export function prepareCKernel(): { readonly samples: number; readonly run: () => Pass; readonly compiler: string; readonly cleanup: () => void } {
  const plan = planDesign(requireValidSpec(mainsSyncSpec)).bitTrue!;
  const c = prepareC(plan, inputCodes(mainsSyncSpec, plan, SAMPLES));
  return { samples: SAMPLES, run: () => c.run(1), compiler: `${c.compiler} -O2`, cleanup: c.cleanup };
}

const best = (a: Pass, b: Pass): Pass => ({ seconds: Math.min(a.seconds, b.seconds), cpuSeconds: Math.min(a.cpuSeconds, b.cpuSeconds), checksum: b.checksum });
const NO_PASS: Pass = { seconds: Infinity, cpuSeconds: Infinity, checksum: 0 };

/**
 * The simulation a user runs (float and bit-true loops on the same input, decimated min/max traces
 * of 1000 buckets, every metric): samples per second of CPU time and of wall-clock time, best of 5.
 */
function simulateFigure(mode: 'both' | 'float' | 'bit-true', bitTrueKernel: BitTrueKernelChoice = 'wasm'): { samplesPerS: number; wallSamplesPerS: number } {
  const plan = planDesign(requireValidSpec(mainsSyncSpec));
  const sc: Scenario = { kind: 'tone', offsetHz: 1, durationS: 100 };
  simulatePlan(plan, { ...sc, durationS: 5 }, { mode, bitTrueKernel });
  let pass = NO_PASS;
  let samples = 0;
  for (let r = 0; r < 5; r++) {
    pass = best(pass, timed(() => {
      samples = simulatePlan(plan, sc, { mode, bitTrueKernel }).sampleCount;
      return 0;
    }));
  }
  return { samplesPerS: Math.round(samples / pass.cpuSeconds), wallSamplesPerS: Math.round(samples / pass.seconds) };
}

/** Issue 16: golden vectors at >= 5 M samples per second of CPU time. */
const VECTOR_TARGET_SAMPLES_PER_S = 5_000_000;

/** The release's golden vectors of each demo spec (record, checksum), samples per second of CPU time after a warm-up (40 runs of 65 536 samples). */
function goldenVectorFigures(runs = 40): { example: string; samples: number; samplesPerS: number; target: number; met: boolean }[] {
  return exampleSpecs.map((e) => {
    const plan = planDesign(requireValidSpec(e.spec));
    const loop = { spec: plan.spec, sections: plan.filter.sections, bitTrue: plan.bitTrue, bitTrueIssue: plan.bitTrueIssue };
    for (let i = 0; i < runs / 2; i++) releaseGoldenVectors(loop);
    let samples = 0;
    const pass = timed(() => {
      for (let i = 0; i < runs; i++) samples += releaseGoldenVectors(loop).record.length;
      return 0;
    });
    const samplesPerS = Math.round(samples / pass.cpuSeconds);
    return { example: e.id, samples: samples / runs, samplesPerS, target: VECTOR_TARGET_SAMPLES_PER_S, met: samplesPerS >= VECTOR_TARGET_SAMPLES_PER_S };
  });
}

/**
 * What the release's record (GOLDEN_VECTOR_SAMPLES, 65 536) costs a cut in dsp: its vector run and
 * its CSV, CPU ms per demo spec (median of 7 after a warm-up). The hex files and the rest of the cut
 * are in the release bench (packages/api/bench/release-bench.ts).
 */
function recordFigures(): { samples: number; examples: { example: string; vectorsCpuMs: number; csvCpuMs: number; csvBytes: number }[] } {
  const examples = exampleSpecs.map((e) => {
    const plan = planDesign(requireValidSpec(e.spec));
    const loop = { spec: plan.spec, sections: plan.filter.sections, bitTrue: plan.bitTrue, bitTrueIssue: plan.bitTrueIssue };
    const scenario = defaultGoldenScenario(plan.spec);
    const vectors: number[] = [];
    const csv: number[] = [];
    let bytes = 0;
    for (let r = 0; r < 9; r++) {
      let v: ReturnType<typeof goldenVectorsOf> | undefined;
      const a = timed(() => {
        v = goldenVectorsOf(loop, scenario);
        return 0;
      });
      const b = timed(() => {
        bytes = formatVectorsCsv(v!).length;
        return 0;
      });
      if (r < 2) continue;
      vectors.push(a.cpuSeconds * 1000);
      csv.push(b.cpuSeconds * 1000);
    }
    return { example: e.id, vectorsCpuMs: round3(median(vectors)), csvCpuMs: round3(median(csv)), csvBytes: bytes };
  });
  return { samples: GOLDEN_VECTOR_SAMPLES, examples };
}

/** Issue target: one demo spec's measured acquisition in under a second (median). */
const ACQUISITION_TARGET_MS = 1000;

/**
 * measureAcquisition per demo spec: the median of 3 runs each (after a warm-up), CPU time as the rest
 * of the bench, with the samples it simulated and the widest bracket relative to its tolerance.
 */
function measureAcquisitionBench(): Record<string, unknown> {
  const perSpec = exampleSpecs.map((e) => {
    measureAcquisition(e.spec);
    const ms: number[] = [];
    let samples = 0;
    let bracketOk = true;
    for (let r = 0; r < 3; r++) {
      ms.push(timed(() => {
        const a = measureAcquisition(e.spec);
        samples = a.samplesSimulated;
        bracketOk = [a.lockInHz, a.pullOutHz, a.holdInHz, a.pullInHz].every((m) => m.limitedBy !== 'sample-budget' && m.limitedBy !== 'bisection-steps');
        return 0;
      }).cpuSeconds * 1000);
    }
    const medianMs = ms.sort((x, y) => x - y)[1]!;
    return { spec: e.spec.name, medianMs: Math.round(medianMs), samples, bracketsWithinTolerance: bracketOk, met: medianMs < ACQUISITION_TARGET_MS };
  });
  return { what: 'measureAcquisition per demo spec, median of 3 (CPU ms)', targetMs: ACQUISITION_TARGET_MS, perSpec, met: perSpec.every((p) => p.met) };
}

/** Issue targets (per sample, against the C build of the same loop). */
const KERNEL_RATIO_TARGET = 0.9;
export const TRACED_RATIO_TARGET = 0.5;

export async function runDspBench(): Promise<Record<string, unknown>> {
  const spec = mainsSyncSpec;
  const plan = planDesign(requireValidSpec(spec)).bitTrue!;
  const codes = inputCodes(spec, plan, SAMPLES);
  runTs(plan, codes.subarray(0, 200_000)); // warm-up: let the JIT compile the hot loops
  runWasm(plan, codes.subarray(0, 200_000));
  const c = prepareC(plan, codes);
  // Interleave the three so a busy machine slows them alike; keep the best pass of each.
  let ts = NO_PASS;
  let wasm = NO_PASS;
  let cBest = NO_PASS;
  try {
    for (let r = 0; r < REPEATS; r++) {
      ts = best(ts, runTs(plan, codes));
      wasm = best(wasm, runWasm(plan, codes));
      cBest = best(cBest, c.run(1));
    }
  } finally {
    c.cleanup();
  }
  const perS = (p: Pass) => Math.round(SAMPLES / p.cpuSeconds);
  const cSamplesPerS = perS(cBest);
  const kernelRatio = perS(wasm) / cSamplesPerS;
  const both = simulateFigure('both');
  const float = simulateFigure('float');
  const bitTrue = simulateFigure('bit-true');
  const tracedRatio = both.samplesPerS / cSamplesPerS;
  return {
    spec: spec.name,
    sections: plan.sectionCount,
    samples: SAMPLES,
    widths: { dataBits: plan.dataBits, coefficientBits: plan.coefficientBits, ncoAccumulatorBits: plan.ncoAccumulatorBits, phaseBits: plan.phaseBits, amplitudeBits: plan.amplitudeBits },
    timing: 'samples per second of process CPU time (best pass), so other work on the shared machine does not count; wall-clock figures beside',
    bitTrueSamplesPerS: perS(wasm),
    bitTrueWallSamplesPerS: Math.round(SAMPLES / wasm.seconds),
    bitTrueKernel: 'wasm',
    typescriptKernelSamplesPerS: perS(ts),
    cSamplesPerS,
    cWallSamplesPerS: Math.round(SAMPLES / cBest.seconds),
    checksumWasm: wasm.checksum,
    checksumTs: ts.checksum,
    checksumC: cBest.checksum,
    checksumEqual: wasm.checksum === cBest.checksum && ts.checksum === cBest.checksum,
    compiler: `${c.compiler} -O2`,
    kernel: { ratioToC: round3(kernelRatio), target: KERNEL_RATIO_TARGET, met: kernelRatio >= KERNEL_RATIO_TARGET, typescriptRatioToC: round3(perS(ts) / cSamplesPerS) },
    traced: {
      what: 'simulate, mode both: float and bit-true loops, 1000-bucket min/max traces and metrics, 10^6 samples of a tone (mains-sync example)',
      bothSamplesPerS: both.samplesPerS,
      bothWallSamplesPerS: both.wallSamplesPerS,
      floatSamplesPerS: float.samplesPerS,
      bitTrueSamplesPerS: bitTrue.samplesPerS,
      /**
       * The slower of the two halves alone: what a 'both' run split over two cores (mergeSimResults)
       * waits for, before the planning, answer encoding and messages of the product's split, which
       * the api bench's tracedSplit measures through the compute pool.
       */
      slowerHalfSamplesPerS: Math.min(float.samplesPerS, bitTrue.samplesPerS),
      bitTrueTypescriptKernelSamplesPerS: simulateFigure('bit-true', 'typescript').samplesPerS,
      ratioToC: round3(tracedRatio),
      ratioOf: 'bothSamplesPerS: both loops one after the other on one core, CPU time; split over two cores, wall clock: api bench tracedSplit',
      target: TRACED_RATIO_TARGET,
      met: tracedRatio >= TRACED_RATIO_TARGET,
    },
    analyzeDesign: await runAnalysisBench(),
    wordLengthSearch: runWordLengthBench(),
    goldenVectors: goldenVectorFigures(),
    goldenRecord: recordFigures(),
    measureAcquisition: measureAcquisitionBench(),
    loadAverage1m: Math.round(loadavg()[0]! * 100) / 100,
  };
}

const round3 = (x: number) => Math.round(x * 1000) / 1000;

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  runDspBench().then((r) => process.stdout.write(`${JSON.stringify(r, null, 2)}\n`));
}
