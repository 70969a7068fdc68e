import { describe, expect, it } from 'vitest';
import { goldenVectors } from '../../src/planDesign.ts';
import { defaultGoldenScenario, GOLDEN_VECTOR_SAMPLES } from '../../src/vectors/goldenVectors.ts';
import { formatVectorsCsv, VECTOR_CSV_COLUMNS, phaseDecimal } from '../../src/vectors/vectorsCsv.ts';
import { ifFmDemodSpec, mainsSyncSpec, ultrasonicSinglePoleSpec } from '../../src/spec/examples.ts';
import { checksumRecord, CHECKSUM_BASIS } from '../../src/sim/checksum.ts';

describe('golden vectors', () => {
  it('are deterministic: the same spec gives the same record, checksum and CSV', () => {
    const a = goldenVectors(mainsSyncSpec);
    const b = goldenVectors(mainsSyncSpec);
    expect(a.record.length).toBe(GOLDEN_VECTOR_SAMPLES);
    expect(a.checksum).toBe(b.checksum);
    expect(formatVectorsCsv(a)).toBe(formatVectorsCsv(b));
    expect(checksumRecord(CHECKSUM_BASIS, a.record, a.record.length)).toBe(a.checksum);
  });

  it('run for a centre frequency whose 2·f ripple period is far longer than the run (centerHz 6.87e-5 Hz)', () => {
    // The settle boxcar of one ripple period would be ~7e11 entries; one longer than the run averages the same samples.
    const v = goldenVectors({ ...ifFmDemodSpec, centerHz: 6.87e-5 });
    expect(v.record.length).toBe(GOLDEN_VECTOR_SAMPLES);
  });

  it('name nco.gainHzPerUnit when their tone (0.01·gainHzPerUnit above centre) would pass Nyquist', () => {
    expect(() => goldenVectors({ ...mainsSyncSpec, centerHz: 4990, nco: { ...mainsSyncSpec.nco, gainHzPerUnit: 2000 } })).toThrow(/^nco.gainHzPerUnit 2000: the golden-vector scenario/);
  });

  it('change when any arithmetic setting changes', () => {
    const base = goldenVectors(ultrasonicSinglePoleSpec).checksum;
    const other = goldenVectors({ ...ultrasonicSinglePoleSpec, fixedPoint: { ...ultrasonicSinglePoleSpec.fixedPoint, rounding: 'truncate' } }).checksum;
    expect(other).not.toBe(base);
  });

  it('default scenario is a seeded noisy tone 1 % of the pull range off centre', () => {
    const s = defaultGoldenScenario(mainsSyncSpec);
    expect(s).toMatchObject({ kind: 'tone', offsetHz: 0.2, seed: 1, snrDb: 40 });
    expect(s.durationS * mainsSyncSpec.sampleRateHz).toBeCloseTo(GOLDEN_VECTOR_SAMPLES, 9);
  });

  it('formats a header of the documented columns and one row per sample', () => {
    const v = goldenVectors(ultrasonicSinglePoleSpec);
    const lines = formatVectorsCsv(v).trimEnd().split('\n');
    expect(lines[0]).toBe('sample,input_code,nco_phase,table_address,nco_code,detector_code,filter_code');
    expect(VECTOR_CSV_COLUMNS.length).toBe(7);
    expect(lines.length).toBe(GOLDEN_VECTOR_SAMPLES + 1);
    const row = lines[10]!.split(',').map(Number);
    expect(row[0]).toBe(9);
    expect(row[1]).toBe(v.record.inputCode[9]);
    expect(row[2]).toBe(v.record.phaseLo[9]);
    // Table address = (phase >> (N − P)) + 2^(P−2) mod 2^P (the cos offset), README "Bit-true arithmetic".
    const n = ultrasonicSinglePoleSpec.nco;
    expect(row[3]).toBe((Math.floor(row[2]! / 2 ** (n.accumulatorBits - n.phaseBits)) + 2 ** (n.phaseBits - 2)) % 2 ** n.phaseBits);
  });

  it('hold a shorter run of the same scenario as their first samples (same seed, same loop)', () => {
    const long = goldenVectors(ultrasonicSinglePoleSpec);
    const short = goldenVectors(ultrasonicSinglePoleSpec, { ...defaultGoldenScenario(ultrasonicSinglePoleSpec), durationS: 4096 / ultrasonicSinglePoleSpec.sampleRateHz });
    expect(short.record.length).toBe(4096);
    expect(formatVectorsCsv(long, 4096)).toBe(formatVectorsCsv(short));
  });

  it('writes 64-bit phases exactly', () => {
    // 2^63 + 5 = 9223372036854775813 (hi = 2^31, lo = 5).
    expect(phaseDecimal(2 ** 31, 5)).toBe('9223372036854775813');
    expect(phaseDecimal(1, 0)).toBe('4294967296');
    expect(phaseDecimal(0, 4294967295)).toBe('4294967295');
  });
});
