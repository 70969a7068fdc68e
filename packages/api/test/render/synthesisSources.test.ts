/** The Verilog an estimate synthesises is the release's own: the same bytes as the cut files (common practice, no source: estimate what you ship). */
import { mainsSyncSpec, referenceRtlTiming, ultrasonicLagLeadSpec } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';
import { computeDesign } from '../../src/render/compute.ts';
import { synthesisSources } from '../../src/render/synthesisSources.ts';
import { renderRelease } from './release.ts';

describe.each([mainsSyncSpec, ultrasonicLagLeadSpec])('synthesis sources of $name', (spec) => {
  it('equal the include and RTL files of its release, and name the loop as top', () => {
    const release = renderRelease(spec);
    const design = computeDesign(spec);
    if (!design.ok) throw new Error('the demo spec has a bit-true loop');
    const sources = synthesisSources(design.plan);
    expect(sources.top).toBe(`${spec.name}_loop`);
    expect([...sources.files.keys()].sort()).toEqual([`${spec.name}.vh`, ...sources.modules].sort());
    for (const [name, text] of sources.files) expect(text, name).toBe(release.files.find((f) => f.name === name)?.bytes.toString('utf8'));
  });
});

describe('the manifest of a release', () => {
  it('records the reference RTL timing, what it has by construction and the samples its testbenches replay, and leaves the yosys estimate to the verification record', () => {
    const results = renderRelease(mainsSyncSpec).manifest.results as { referenceRtl: Record<string, unknown> };
    expect(results.referenceRtl).toEqual({
      ...referenceRtlTiming(2),
      romBits: 4096 * 16,
      // The first 4096 of the record (render/rtl.ts, RTL_REPLAY_SAMPLES), so a verification replays a few seconds' worth.
      testbenchSamples: 4096,
      resourceEstimate: 'yosys, made by the server after the cut: see the release verification record',
    });
  });
});
