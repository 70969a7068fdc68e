/** The pure parts: state machine, tokens, vector comparison, diff. */
import { VECTOR_CSV_COLUMNS } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';
import { changedFigures } from '../../src/releases/diff.ts';
import { issueToken, parseToken, tokenHash, tokenMatches } from '../../src/releases/reviewToken.ts';
import { RELEASE_EVENTS, RELEASE_STATES } from '@loopwright/contract';
import { allowedEvents, transition } from '../../src/releases/stateMachine.ts';
import { compareCapture, compareWithGolden, goldenFromRows, readVectorCsv } from '../../src/releases/vectorCompare.ts';

describe('release state machine', () => {
  it('allows exactly the documented transitions', () => {
    const allowed = RELEASE_STATES.flatMap((from) => RELEASE_EVENTS.flatMap((e) => {
      const t = transition(from, e);
      return t.ok ? [`${from} -${e}-> ${t.to}`] : [];
    }));
    expect(allowed.sort()).toEqual(
      [
        'draft -request-review-> in-review',
        'in-review -approve-> approved',
        'in-review -request-changes-> changes-requested',
        'draft -withdraw-> withdrawn',
        'in-review -withdraw-> withdrawn',
        'changes-requested -withdraw-> withdrawn',
        'approved -withdraw-> withdrawn',
      ].sort(),
    );
  });

  it('says why a transition is refused', () => {
    const t = transition('approved', 'approve');
    expect(t.ok).toBe(false);
    expect(!t.ok && t.message).toBe('cannot approve a release that is approved (only from: in-review)');
    expect(allowedEvents('withdrawn')).toEqual([]);
  });
});

describe('review tokens', () => {
  const binding = { releaseId: 7, reviewerId: 3, manifestSha256: 'a'.repeat(64) };

  it('are random, parse back, and verify only with their own binding', () => {
    const a = issueToken(binding);
    const b = issueToken(binding);
    expect(a.token).not.toBe(b.token);
    const parsed = parseToken(a.token)!;
    expect(parsed.selector).toBe(a.selector);
    expect(tokenMatches(parsed.secret, { ...binding, selector: a.selector }, a.tokenHash)).toBe(true);
    expect(tokenMatches(parsed.secret, { ...binding, selector: a.selector, reviewerId: 4 }, a.tokenHash)).toBe(false);
    expect(tokenMatches(parsed.secret, { ...binding, selector: a.selector, manifestSha256: 'b'.repeat(64) }, a.tokenHash)).toBe(false);
    expect(tokenMatches(parseToken(b.token)!.secret, { ...binding, selector: a.selector }, a.tokenHash)).toBe(false);
  });

  it('store only a SHA-256 that does not contain the secret', () => {
    const a = issueToken(binding);
    const secret = parseToken(a.token)!.secret;
    expect(a.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    expect(a.tokenHash).toBe(tokenHash(secret, { ...binding, selector: a.selector }));
    expect(a.tokenHash.includes(secret)).toBe(false);
  });

  it('refuse any other shape', () => {
    for (const t of ['', 'abc', `${'a'.repeat(12)}.${'b'.repeat(42)}`, `${'a'.repeat(12)}.${'b'.repeat(43)}x`, `${'a'.repeat(11)}!.${'b'.repeat(43)}`]) {
      expect(parseToken(t)).toBeNull();
    }
  });
});

describe('golden vector comparison (dsp compareVectors on the stored CSV)', () => {
  const header = VECTOR_CSV_COLUMNS.join(',');
  const row = (n: number, f = 0) => [n, 10, 4294967295, 3, -7, 5, f].join(',');
  const scenario = { kind: 'tone', offsetHz: 0, durationS: 1 } as const;
  const compareVectors = (g: string[][], got: string[][]) => compareWithGolden(goldenFromRows(g, scenario, 32), got);
  const parseVectorCsv = (text: string, maxRows?: number) => readVectorCsv(Buffer.from(text), maxRows);
  const goldenText = [header, row(0), row(1), row(2)].join('\n') + '\n';

  it('is bit-exact for the same numbers, however they are spaced or zero-padded', () => {
    const got = parseVectorCsv(`${header}\r\n${row(0)}\r\n 1, 10, 4294967295, 3, -07, 5, 0\r\n${row(2)}\r\n`);
    expect(compareVectors(parseVectorCsv(goldenText), got)).toEqual({ verdict: 'bit-exact', samplesCompared: 3, mismatchCount: 0, firstMismatches: [] });
  });

  it('counts every differing value and reports the first ten', () => {
    const many = parseVectorCsv([header, ...Array.from({ length: 30 }, (_, n) => row(n))].join('\n'));
    const got = parseVectorCsv([header, ...Array.from({ length: 30 }, (_, n) => row(n, n % 2))].join('\n'));
    const r = compareVectors(many, got);
    expect(r.mismatchCount).toBe(15);
    expect(r.firstMismatches).toHaveLength(10);
    expect(r.firstMismatches[0]).toEqual({ sampleIndex: 1, column: 'filter_code', expected: '0', got: '1' });
  });

  it('keeps 64-bit phase words exact through the stored-CSV record', () => {
    const wide = parseVectorCsv(`${header}\n0,1,18446744073709551615,2,3,4,5\n`);
    expect(compareVectors(wide, wide).verdict).toBe('bit-exact');
    const off = parseVectorCsv(`${header}\n0,1,18446744073709551614,2,3,4,5\n`);
    expect(compareVectors(wide, off).firstMismatches).toEqual([{ sampleIndex: 0, column: 'nco_phase', expected: '18446744073709551615', got: '18446744073709551614' }]);
  });

  it('counts missing samples as mismatches', () => {
    const got = parseVectorCsv([header, row(0)].join('\n'));
    const r = compareVectors(parseVectorCsv(goldenText), got);
    expect(r.verdict).toBe('mismatch');
    expect(r.mismatchCount).toBe(2);
    expect(r.firstMismatches[0]).toEqual({ sampleIndex: 1, column: 'sample', expected: '1', got: '(missing)' });
  });

  it('names the line of a malformed file', () => {
    expect(() => parseVectorCsv('')).toThrow(/^line 1: the file is empty/);
    expect(() => parseVectorCsv('a,b\n1,2\n')).toThrow(/^line 1: the header must be/);
    expect(() => parseVectorCsv(`${header}\n${row(0)}\n1,2,3\n`)).toThrow(/^line 3: expected 7 values, got 3/);
    expect(() => parseVectorCsv(`${header}\n${row(0)}\n${row(1).replace('-7', 'x')}\n`)).toThrow(/^line 3: column nco_code: "x" is not a decimal integer/);
    expect(() => parseVectorCsv(`${header}\n"unterminated\n`)).toThrow(/^line \d+: not readable as CSV/);
    expect(() => parseVectorCsv(`${header}\n${row(0)}\n${row(1)}\n${row(2)}\n`, 2)).toThrow(/^line 4: the file has the wrong length: the release's golden vectors hold 2 samples, and this file has more rows/);
  });

  it('says a header-only or cut-off file has the wrong length, with both sample counts', () => {
    const golden = Buffer.from(goldenText);
    expect(() => compareCapture(golden, Buffer.from(`${header}\n`), scenario, 32)).toThrow(
      /^the file has the wrong length: expected 3 samples \(one row each after the header, as in the release's golden vectors\), found none \(the file holds the header only\)$/,
    );
    expect(() => compareCapture(golden, Buffer.from([header, row(0), row(1)].join('\n')), scenario, 32)).toThrow(/^the file has the wrong length: expected 3 samples .*, found 2$/);
    expect(compareCapture(golden, golden, scenario, 32).verdict).toBe('bit-exact');
  });

  it('refuses a binary file as not CSV text instead of quoting what the parser made of it', () => {
    // A gzip member starts 1f 8b 08 (RFC 1952); a UTF-16 export puts a NUL after every ASCII byte.
    const gzip = Buffer.from([0x1f, 0x8b, 0x08, 0x00, 0x00, 0x00, 0x00, 0x00, 0x00, 0x03, 0x4b, 0x4c]);
    expect(() => parseVectorCsv(gzip.toString('latin1'))).toThrow(/^line 1: this is not a CSV text file \(byte 0x1f at byte offset 0: binary data/);
    expect(() => readVectorCsv(gzip)).toThrow(/not a CSV text file/);
    const utf16 = Buffer.from(`${header}\n${row(0)}\n`, 'utf16le');
    expect(() => readVectorCsv(utf16)).toThrow(/^line 1: this is not a CSV text file \(byte 0x00 at byte offset 1/);
    expect(() => readVectorCsv(Buffer.from([0x73, 0x61, 0xff, 0xfe, 0x0a]))).toThrow(/^this is not a CSV text file \(it is not valid UTF-8/);
  });

  it('quotes a wrong header with its invisible characters escaped', () => {
    expect(() => parseVectorCsv('sample,\u202einput\n1\n')).toThrow(/got "sample,\\u202einput"/);
  });
});

describe('diff of two lists of figures', () => {
  it('lists changed, added and removed figures by key, labelled from the newer side (common practice, no source)', () => {
    const f = (key: string, value: string, label = key) => ({ key, label, unit: 'bits', value });
    expect(changedFigures([f('A', '1'), f('B', '2', 'old'), f('C', '3')], [f('A', '1'), f('B', '4', 'new'), f('D', '5')])).toEqual([
      { key: 'B', label: 'new', unit: 'bits', before: '2', after: '4' },
      { key: 'D', label: 'D', unit: 'bits', before: null, after: '5' },
      { key: 'C', label: 'C', unit: 'bits', before: '3', after: null },
    ]);
  });
});
