/**
 * A simulation's answer is encoded in the compute thread and wrapped on the event loop
 * (src/encodedJson.ts); the bytes must be JSON.stringify's (ECMA262, JSON.stringify: members in
 * insertion order, undefined members left out), but with every typed array written as the JSON array
 * of its numbers, which JSON.stringify itself writes as an object of its indices. The reference here
 * is JSON.stringify with a replacer, a way of its own from the encoder's copy.
 */
import { mainsSyncSpec, simulate } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';
import { encodedJsonOf, encodedObject, encodeJson } from '../src/encodedJson.ts';
import { typedArraysAsArrays } from './typedArraysAsArrays.ts';

describe('answers encoded off the event loop', () => {
  it('wraps an encoded simulation into the bytes JSON.stringify makes of the whole answer', () => {
    const scenario = { kind: 'frequency-step', stepHz: 0.5, atS: 0.1, durationS: 0.2 } as const;
    const simulation = simulate(mainsSyncSpec, scenario, { mode: 'both', buckets: 20 });
    const answer = { scenario, simulation, designId: 3, revision: undefined };
    const encoded = encodedObject({ scenario, simulation: encodedJsonOf(encodeJson(simulation)), designId: 3, revision: undefined });
    expect(encoded.bytes.equals(Buffer.from(typedArraysAsArrays(answer)))).toBe(true);
  });

  it('writes the traces and the sine table as JSON arrays of the same numbers', () => {
    const simulation = simulate(mainsSyncSpec, { kind: 'tone', offsetHz: 1, durationS: 0.1 }, { mode: 'both', buckets: 20 });
    const decoded = JSON.parse(Buffer.from(encodeJson(simulation)).toString('utf8')) as typeof simulation;
    const trace = simulation.float!.traces.phaseErrorRad;
    expect(decoded.float!.traces.phaseErrorRad.min).toEqual(Array.from(trace.min));
    expect(decoded.float!.traces.phaseErrorRad.bucketStartS).toEqual(Array.from(trace.bucketStartS));
    expect(decoded.plan!.sineTable).toEqual(Array.from(simulation.plan!.sineTable));
    expect(Array.isArray(decoded.bitTrue!.traces.lockIndicator.max)).toBe(true);
  });

  it('writes a typed array as JSON.stringify writes a plain array of it (non-finite numbers as null, -0 as 0), and keeps toJSON', () => {
    const value = { a: new Float64Array([1.5, -0, NaN, Infinity, 1e-300]), b: [new Int32Array([-7, 2 ** 31 - 1])], c: undefined, d: new Date(0), e: { f: new Uint8Array(0) } };
    expect(new TextDecoder().decode(encodeJson(value))).toBe(typedArraysAsArrays(value));
    expect(new TextDecoder().decode(encodeJson(value))).toBe('{"a":[1.5,0,null,null,1e-300],"b":[[-7,2147483647]],"d":"1970-01-01T00:00:00.000Z","e":{"f":[]}}');
  });

  it('encodes text beyond ASCII as UTF-8 and an empty object as {}', () => {
    const value = { name: 'Phasenregelschleife ±0,5 Hz — 相位', n: [1, 2] };
    expect(encodedObject({ value: encodedJsonOf(encodeJson(value)) }).bytes.toString('utf8')).toBe(JSON.stringify({ value }));
    expect(encodedObject({ value: new Int16Array([3, -4]) }).bytes.toString('utf8')).toBe('{"value":[3,-4]}');
    expect(encodedObject({}).bytes.toString()).toBe('{}');
  });
});
