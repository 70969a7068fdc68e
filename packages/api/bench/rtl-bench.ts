/**
 * Reference-RTL benchmark (not a timed test): for each demo spec, render the release into a folder and
 * run both testbenches on all its golden samples (what the server's verification does after a cut),
 * against the target of a release verified in under 10 s on this 2-core machine; the yosys estimate's
 * time apart; and each simulator's samples per second (compile included) beside the TypeScript
 * bit-true model's (the golden-vector simulation of the same samples).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { exampleSpecs, tryPlanDesign } from '@loopwright/dsp';
import { renderArtifacts } from '../src/render/artifacts.ts';
import { computeRelease } from '../src/render/compute.ts';
import { synthesisSources } from '../src/render/synthesisSources.ts';
import { estimateResources } from '../src/rtl/estimate.ts';
import { verifyFolder } from '../src/rtl/verify.ts';

const TARGET_S = 10;
const round = (x: number, digits = 0) => Math.round(x * 10 ** digits) / 10 ** digits;

export async function runRtlBench(): Promise<unknown> {
  const load1 = (await import('node:os')).loadavg()[0];
  const specs = [];
  for (const example of exampleSpecs) {
    const spec = example.spec;
    const dir = mkdtempSync(join(tmpdir(), 'lw-rtl-bench-'));
    try {
      const started = performance.now();
      const computed = computeRelease(spec);
      if (!computed.ok) throw new Error(`${spec.name} cannot be released`);
      const rendered = renderArtifacts(computed.release);
      for (const f of rendered.files) writeFileSync(join(dir, f.name), f.bytes);
      const renderMs = performance.now() - started;
      const verification = await verifyFolder(dir);
      const verifiedS = (performance.now() - started) / 1000;
      // The model's time for the same samples: a plan with golden vectors less one without.
      const t0 = performance.now();
      tryPlanDesign(spec);
      const t1 = performance.now();
      tryPlanDesign(spec, { goldenVectors: true });
      const modelS = Math.max(1e-6, (performance.now() - t1 - (t1 - t0)) / 1000);
      const samples = computed.release.plan.goldenVectors.record.length;
      // The testbenches replay a prefix of the record (render/rtl.ts, RTL_REPLAY_SAMPLES): their rate is per sample replayed.
      const replayed = verification.samples;
      const estimate = await estimateResources(synthesisSources(computed.release.plan));
      specs.push({
        spec: spec.name,
        samples,
        replayedSamples: replayed,
        verdict: verification.verdict,
        renderMs: round(renderMs),
        simulators: verification.runs.map((r) => ({
          simulator: r.label,
          verdict: r.verdict,
          durationMs: r.durationMs,
          samplesPerS: r.durationMs > 0 ? round((replayed / r.durationMs) * 1000) : null,
        })),
        renderAndVerifyS: round(verifiedS, 2),
        target: { s: TARGET_S, met: verification.verdict === 'passed' && verifiedS < TARGET_S },
        bitTrueModelSamplesPerS: round(samples / modelS),
        yosys: estimate.state === 'estimated' ? { durationMs: estimate.durationMs, luts: estimate.total.generic.luts, flipFlops: estimate.total.generic.flipFlops } : { notEstimated: estimate.reason },
      });
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }
  return { loadAverage1mBefore: round(load1 ?? 0, 2), note: 'simulator samples/s include compiling the testbench; both simulators run at once, as on the server', specs };
}
