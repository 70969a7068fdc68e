/** The Verilog an estimate synthesises is the release's own: the same bytes as the cut files (common practice, no source: estimate what you ship). */
import { mainsSyncSpec, ultrasonicLagLeadSpec } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';
import { renderArtifacts } from '../../src/render/artifacts.ts';
import { computeDesign, computeRelease } from '../../src/render/compute.ts';
import { synthesisSources } from '../../src/render/synthesisSources.ts';

describe.each([mainsSyncSpec, ultrasonicLagLeadSpec])('synthesis sources of $name', (spec) => {
  it('equal the include and RTL files of its release, and name the loop as top', () => {
    const release = renderArtifacts(computeRelease(spec));
    const sources = synthesisSources(computeDesign(spec));
    expect(sources.top).toBe(`${spec.name}_loop`);
    expect([...sources.files.keys()].sort()).toEqual([`${spec.name}.vh`, ...sources.modules].sort());
    for (const [name, text] of sources.files) expect(text, name).toBe(release.files.find((f) => f.name === name)?.bytes.toString('utf8'));
  });
});
