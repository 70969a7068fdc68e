/// <reference types="node" />
/**
 * dsp benchmark (not a test; no timing is asserted anywhere): bit-true loop throughput against the
 * same loop in plain C (bench/loop.c, gcc -O2), with equal checksums so both did the same work;
 * float simulation throughput; analyzeDesign time. Run: node --import tsx bench/bench.ts
 * (prints JSON). The root bench imports runDspBench().
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { mainsSyncSpec, exampleSpecs } from '../src/spec/examples.ts';
import type { LoopSpec } from '../src/spec/schema.ts';
import type { Scenario } from '../src/spec/scenario.ts';
import type { BitTruePlan } from '../src/types/sim.ts';
import { allocInputChunk, inputGenerator } from '../src/sim/inputSignal.ts';
import { initialBitTrueState, quantizeInput, runBitTrueChunk } from '../src/sim/bitTrueKernel.ts';
import { CHUNK_SAMPLES } from '../src/sim/simulate.ts';
import { planDesign, simulate } from '../src/planDesign.ts';
import { requireValidSpec } from '../src/spec/schema.ts';
import { measureAcquisition } from '../src/analysis/acquisitionSim.ts';
import { formatCParams } from './cParams.ts';
import { runAnalysisBench, runWordLengthBench } from './analysis.ts';

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

/** The TypeScript bit-true loop over all codes, chunk by chunk; it keeps the record checksum as loop.c does. */
function runTs(plan: BitTruePlan, codes: Int32Array): { seconds: number; checksum: number } {
  const state = initialBitTrueState(plan);
  const out = {
    phaseHi: new Uint32Array(CHUNK_SAMPLES),
    phaseLo: new Uint32Array(CHUNK_SAMPLES),
    tableAddress: new Int32Array(CHUNK_SAMPLES),
    ncoCode: new Int32Array(CHUNK_SAMPLES),
    detectorCode: new Int32Array(CHUNK_SAMPLES),
    filterCode: new Int32Array(CHUNK_SAMPLES),
  };
  const t0 = performance.now();
  for (let n0 = 0; n0 < codes.length; n0 += CHUNK_SAMPLES) {
    const count = Math.min(CHUNK_SAMPLES, codes.length - n0);
    runBitTrueChunk(plan, state, codes.subarray(n0, n0 + count), count, out);
  }
  return { seconds: (performance.now() - t0) / 1000, checksum: state.checksum };
}

/** Compile loop.c once; returns a runner that times one pass (best of `repeats` inside the C program). */
function prepareC(plan: BitTruePlan, codes: Int32Array): { run: (repeats: number) => { seconds: number; checksum: number }; compiler: string; cleanup: () => void } {
  const dir = mkdtempSync(path.join(tmpdir(), 'loopwright-bench-'));
  const exe = path.join(dir, 'loop');
  execFileSync('gcc', ['-O2', '-o', exe, path.join(HERE, 'loop.c')]);
  const params = path.join(dir, 'params.txt');
  const input = path.join(dir, 'input.bin');
  writeFileSync(params, formatCParams(plan));
  writeFileSync(input, Buffer.from(codes.buffer, codes.byteOffset, codes.byteLength));
  const compiler = execFileSync('gcc', ['--version'], { encoding: 'utf8' }).split('\n')[0] ?? 'gcc';
  return {
    run: (repeats) => JSON.parse(execFileSync(exe, [params, input, String(repeats)], { encoding: 'utf8' })) as { seconds: number; checksum: number },
    compiler,
    cleanup: () => rmSync(dir, { recursive: true, force: true }),
  };
}

function simulateSamplesPerS(mode: 'float' | 'bit-true'): number {
  const sc: Scenario = { kind: 'tone', offsetHz: 1, durationS: 100 };
  simulate(mainsSyncSpec, { ...sc, durationS: 5 }, { mode });
  const t0 = performance.now();
  const r = simulate(mainsSyncSpec, sc, { mode });
  return r.sampleCount / ((performance.now() - t0) / 1000);
}

/** Mean time of measureAcquisition over the example specs (after one warm-up pass). */
function measureAcquisitionMs(): number {
  for (const e of exampleSpecs) measureAcquisition(e.spec);
  const t0 = performance.now();
  for (const e of exampleSpecs) measureAcquisition(e.spec);
  return (performance.now() - t0) / exampleSpecs.length;
}

/** Issue target: the TypeScript bit-true loop runs at least this fraction of the C loop's speed. */
const RATIO_TO_C_TARGET = 0.6;

export async function runDspBench(): Promise<Record<string, unknown>> {
  const spec = mainsSyncSpec;
  const plan = planDesign(requireValidSpec(spec)).bitTrue!;
  const codes = inputCodes(spec, plan, SAMPLES);
  runTs(plan, codes.subarray(0, 200_000)); // warm-up: let the JIT compile the hot loop
  const c = prepareC(plan, codes);
  // Interleave the two so a busy machine slows both alike; keep the best pass of each.
  let ts = { seconds: Infinity, checksum: 0 };
  let cBest = { seconds: Infinity, checksum: 0 };
  try {
    for (let r = 0; r < REPEATS; r++) {
      const t = runTs(plan, codes);
      if (t.seconds < ts.seconds) ts = t;
      const k = c.run(1);
      if (k.seconds < cBest.seconds) cBest = k;
    }
  } finally {
    c.cleanup();
  }
  const bitTrueSamplesPerS = SAMPLES / ts.seconds;
  const cSamplesPerS = SAMPLES / cBest.seconds;
  return {
    spec: spec.name,
    sections: plan.sectionCount,
    samples: SAMPLES,
    widths: { dataBits: plan.dataBits, coefficientBits: plan.coefficientBits, ncoAccumulatorBits: plan.ncoAccumulatorBits, phaseBits: plan.phaseBits, amplitudeBits: plan.amplitudeBits },
    bitTrueSamplesPerS: Math.round(bitTrueSamplesPerS),
    cSamplesPerS: Math.round(cSamplesPerS),
    ratioToC: Number((bitTrueSamplesPerS / cSamplesPerS).toFixed(3)),
    checksumTs: ts.checksum,
    checksumC: cBest.checksum,
    checksumEqual: ts.checksum === cBest.checksum,
    compiler: `${c.compiler} -O2`,
    simulateFloatSamplesPerS: Math.round(simulateSamplesPerS('float')),
    simulateBitTrueSamplesPerS: Math.round(simulateSamplesPerS('bit-true')),
    ratioToCTarget: RATIO_TO_C_TARGET,
    ratioToCMet: bitTrueSamplesPerS / cSamplesPerS >= RATIO_TO_C_TARGET,
    analyzeDesign: runAnalysisBench(),
    wordLengthSearch: runWordLengthBench(),
    measureAcquisitionMs: measureAcquisitionMs(),
  };
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  runDspBench().then((r) => process.stdout.write(`${JSON.stringify(r, null, 2)}\n`));
}
