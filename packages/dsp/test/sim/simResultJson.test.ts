import { describe, expect, it } from 'vitest';
import { simulate } from '../../src/planDesign.ts';
import { simResultToJson } from '../../src/sim/simResultJson.ts';
import { ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';

describe('simResultToJson', () => {
  it('round-trips through JSON with traces as arrays and metrics intact', () => {
    const r = simulate(ultrasonicSinglePoleSpec, { kind: 'tone', offsetHz: 100, durationS: 0.005 }, { buckets: 50, keepRecord: true });
    const back = JSON.parse(JSON.stringify(simResultToJson(r)));
    expect(back.float.traces.phaseErrorRad.min).toHaveLength(50);
    expect(back.bitTrue.traces.filterOutput.max[49]).toBe(r.bitTrue!.traces.filterOutput.max[49]);
    expect(back.bitTrue.checksum).toBe(r.bitTrue!.checksum);
    expect(back.float.metrics).toEqual(JSON.parse(JSON.stringify(r.float!.metrics)));
    expect(back.bitTrue.record).toBeUndefined();
  });
});
