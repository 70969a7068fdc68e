/**
 * A simulation's answer is encoded in the compute thread and wrapped on the event loop
 * (src/encodedJson.ts); the bytes must be the ones res.json sent before, i.e. JSON.stringify's
 * (ECMA-262, JSON.stringify: members in insertion order, undefined members left out, a typed array
 * written as an object of its indices).
 */
import { mainsSyncSpec, simulate } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';
import { encodedJsonOf, encodedObject, encodeJson } from '../src/encodedJson.ts';

describe('answers encoded off the event loop', () => {
  it('wraps an encoded simulation into the bytes JSON.stringify makes of the whole answer', () => {
    const scenario = { kind: 'frequency-step', stepHz: 0.5, atS: 0.1, durationS: 0.2 } as const;
    const simulation = simulate(mainsSyncSpec, scenario, { mode: 'both', buckets: 20 });
    const answer = { scenario, simulation, designId: 3, revision: undefined };
    const encoded = encodedObject({ scenario, simulation: encodedJsonOf(encodeJson(simulation)), designId: 3, revision: undefined });
    expect(encoded.bytes.equals(Buffer.from(JSON.stringify(answer)))).toBe(true);
  });

  it('encodes text beyond ASCII as UTF-8 and an empty object as {}', () => {
    const value = { name: 'Phasenregelschleife ±0,5 Hz — 相位', n: [1, 2] };
    expect(encodedObject({ value: encodedJsonOf(encodeJson(value)) }).bytes.toString('utf8')).toBe(JSON.stringify({ value }));
    expect(encodedObject({}).bytes.toString()).toBe('{}');
  });
});
