import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { exampleSpecs } from '@loopwright/dsp';
import { canonicalJson } from '../../src/render/digest.ts';

/** Python's json module with sort_keys (Debian's python3): the canonical form, computed apart from ours. */
function pythonSorted(json: string): string {
  return execFileSync('/usr/bin/python3', ['-c', 'import json,sys; sys.stdout.write(json.dumps(json.load(sys.stdin), sort_keys=True, indent=2, ensure_ascii=False))'], {
    input: json,
    encoding: 'utf8',
  });
}

describe('canonical JSON of the manifest and spec digests', () => {
  it('writes the bytes Python json.dumps(sort_keys=True, indent=2) writes for each demo spec and a key-shuffled object', () => {
    const shuffled = { zeta: { b: [3, { y: 'ü', x: null }], a: true }, alpha: 0.125, mid: 'é "quoted"' };
    for (const value of [...exampleSpecs.map((e) => e.spec), shuffled]) {
      expect(canonicalJson(value, 2)).toBe(pythonSorted(JSON.stringify(value)));
    }
  });

  it('writes bigints as decimal strings, also beyond 2^53', () => {
    expect(canonicalJson({ word: 2n ** 64n - 1n, small: 5n })).toBe('{"small":"5","word":"18446744073709551615"}');
  });

  it('refuses a circular value instead of writing a placeholder into a checksummed file', () => {
    const loop: Record<string, unknown> = { name: 'x' };
    loop.self = loop;
    expect(() => canonicalJson(loop)).toThrow(TypeError);
  });
});
