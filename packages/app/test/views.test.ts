import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { mainsSyncSpec, type WordLengthResult } from '@loopwright/dsp';
import { decimateMinMax } from '../src/charts/decimate.ts';
import { bodeOption, magnitudeAxisMin, type BodeTrace } from '../src/charts/bodeOption.ts';
import { envelope, traceOption } from '../src/charts/traceOption.ts';
import { twosComplementHex } from '../src/components/reportView.ts';
import { diffRows, diffSummary, reviewRows, waitingMailNotice } from '../src/components/releaseView.ts';
import { SPEC_SECTIONS } from '../src/form/specFields.ts';
import type { ReviewRecord } from '../src/api/types.ts';
import { coefficientCurveOption, dataCurveOption, widthEdits, widthEditsText, widthVerdictRows } from '../src/components/wordLengthView.ts';
import { wordLengthSearch } from '@loopwright/dsp';
import { auditRows, filterAudit } from '../src/views/adminView.ts';
import { checkScenario, draftToScenario } from '../src/form/scenarioDraft.ts';
import { fmtEng } from '../src/lib/format.ts';
import { afterSignIn } from '../src/lib/redirect.ts';

describe('min/max decimation', () => {
  it('keeps every bucket extreme in order, so a one-sample glitch survives', () => {
    const n = 100_000;
    const x = Float64Array.from({ length: n }, (_, i) => i);
    const y = Float64Array.from({ length: n }, (_, i) => Math.sin(i / 1000));
    y[54_321] = 9;
    const out = decimateMinMax(x, y, 1000);
    expect(out.length).toBeLessThanOrEqual(1000);
    expect(out).toContainEqual([54_321, 9]);
    expect(Math.min(...out.map((p) => p[1]))).toBe(Math.min(...y));
    for (let i = 1; i < out.length; i++) expect(out[i]![0]).toBeGreaterThan(out[i - 1]![0]);
  });

  it('returns short traces untouched', () => {
    expect(decimateMinMax([0, 1, 2], [5, 6, 7], 10)).toEqual([[0, 5], [1, 6], [2, 7]]);
  });

  it('draws a decimated trace as min then max per bucket, scaled and shifted', () => {
    const trace = { bucketStartS: Float64Array.of(0, 1), min: Float64Array.of(-1, 2), max: Float64Array.of(1, 3) };
    expect(envelope(trace, 10, 5)).toEqual([[0, -15], [0, 5], [1, 15], [1, 25]]);
  });
});

describe('Bode magnitude axis', () => {
  it('ignores the dB floor of a zero at Nyquist but keeps real low values', () => {
    const t = (mag: number[]): BodeTrace => ({ label: 'x', freqHz: mag.map((_, i) => i + 1), magnitudeDb: mag, phaseDeg: mag, style: 'discrete' });
    expect(magnitudeAxisMin([t([40, 0, -63, -400])])).toBe(-80);
    expect(magnitudeAxisMin([t([40, 0, -400])])).toBe(-20);
  });
});

describe("two's-complement codes", () => {
  it('matches Python masking the code to the word width', () => {
    const cases: [number, number][] = [[-1, 8], [-126415, 18], [61039, 18], [-(2 ** 17), 18], [40, 18], [-5, 32]];
    // A JSON array of pairs is also a Python list literal. Reference: Python's unbounded ints, x & (2**bits - 1) (general-purpose reference, /usr/bin/python3).
    const script = `for c,b in ${JSON.stringify(cases)}: print(format(c & ((1<<b)-1), 'X'))`;
    const py = spawnSync('/usr/bin/python3', ['-c', script], { encoding: 'utf8' });
    expect(py.status).toBe(0);
    const expected = py.stdout.trim().split('\n');
    cases.forEach(([code, bits], i) => expect(twosComplementHex(code, bits).replace(/^0x0*/, '') || '0').toBe(expected[i]));
  });
});

describe('engineering format', () => {
  it('uses SI prefixes (BIPM SI Brochure, prefixes)', () => {
    expect(fmtEng(10.7e6, 'Hz')).toBe('10.7 MHz');
    expect(fmtEng(2.5e-4, 's')).toBe('250 µs');
    expect(fmtEng(null, 'Hz')).toBe('—');
  });

  it('reaches femto for a tiny NCO frequency error instead of "0.00004227 nHz" (SI9, Table 7)', () => {
    expect(fmtEng(4.227e-14, 'Hz')).toBe('42.27 fHz');
    expect(fmtEng(2e12, 'Hz')).toBe('2 THz');
  });

  it('writes every plot axis tick with an SI prefix and its unit (SI9, Table 7)', () => {
    type Axis = { axisLabel: { formatter: (v: number) => string }; name: string };
    const set = { phaseErrorRad: { bucketStartS: [0, 3e-5], min: [0, 0], max: [0.002, 0.001] }, filterOutput: { bucketStartS: [0, 3e-5], min: [0, 0], max: [1, 1] }, ncoFrequencyHz: { bucketStartS: [0, 3e-5], min: [8e4, 8e4], max: [8e4, 8e4] } } as unknown as Parameters<typeof traceOption>[0]['float'];
    const trace = traceOption({ float: set, bitTrue: null, modulatingHz: null, gainHzPerUnit: 1, centerHz: 0 }) as { xAxis: Axis[]; yAxis: Axis[] };
    expect(trace.xAxis[2]!.axisLabel.formatter(0.00003)).toBe('30 µs');
    expect(trace.xAxis[2]!.axisLabel.formatter(0)).toBe('0 s');
    expect(trace.yAxis[2]!.axisLabel.formatter(80000)).toBe('80 kHz');
    expect(trace.yAxis[0]!.axisLabel.formatter(0.0015)).toBe('1.5 mrad');
    const bode = bodeOption([], { crossoverHz: null, phaseMarginDeg: null, phaseCrossoverHz: null, gainMarginDb: null, nyquistHz: null }).frame({ shown: () => true, zoomPercent: [0, 100] }) as { xAxis: Axis[] };
    expect(bode.xAxis[1]!.axisLabel.formatter(80000)).toBe('80 kHz');
  });
});

describe('release diff rows', () => {
  it('labels spec paths as the editor does and keeps the server order (common practice, no source)', () => {
    const diff = {
      from: { id: 1, label: 'v1' },
      to: { id: 2, label: 'v2' },
      sections: [
        { id: 'formats', title: 'Word formats', rows: [] },
        { id: 'widths', title: 'Widths and counts', rows: [{ key: 'X_NCO_GAIN_SHIFT', label: 'NCO gain shift (right)', unit: 'bits', before: '8', after: '10' }] },
        { id: 'spec', title: 'Spec', rows: [{ key: 'filter.damping', label: 'filter.damping', unit: '', before: '0.707', after: '0.5' }, { key: 'nco.gainHzPerUnit', label: 'nco.gainHzPerUnit', unit: '', before: null, after: '5' }] },
      ],
    };
    const rows = diffRows(diff);
    expect(rows.map((r) => `${r.group}|${r.label}|${r.unit}|${r.before}|${r.after}|${r.key}`)).toEqual([
      'Widths and counts|NCO gain shift (right)|bits|8|10|X_NCO_GAIN_SHIFT',
      `Spec|${SPEC_SECTIONS.flatMap((s) => s.fields).find((f) => f.path === 'filter.damping')!.label}||0.707|0.5|filter.damping`,
      'Spec|NCO gain|Hz/unit|—|5|nco.gainHzPerUnit',
    ]);
    expect(diffSummary(diff)).toBe('v1 → v2: changed Widths and counts 1, Spec 2');
    expect(diffSummary({ ...diff, sections: [] })).toBe('v1 → v2: nothing changed');
  });
});

describe('review e-mail state on the release page', () => {
  const review = (name: string, mail: ReviewRecord['mail']): ReviewRecord => ({
    id: 1,
    reviewerId: 7,
    reviewerName: name,
    decision: null,
    comment: null,
    decidedAt: null,
    expiresAt: '2026-12-09T10:00:00.000Z',
    mail,
  });
  const waiting = review('Robin Reviewer', { state: 'waiting', attempts: 2, sentAt: null, nextAttemptAt: '2026-12-02T10:05:30.000Z' });
  const sent = review('Sam Second', { state: 'sent', attempts: 3, sentAt: '2026-12-02T10:06:00.000Z', nextAttemptAt: null });

  it('says which review e-mail waits for the mail server and when it is tried again, and which went out', () => {
    const rows = reviewRows([waiting, sent, review('Old Request', null)]);
    expect(rows.map((r) => [r.mail, r.mailTone])).toEqual([
      ['waiting to be sent (2 failed attempts; next try 2026-12-02 10:05)', 'warning'],
      ['sent 2026-12-02 10:06', 'success'],
      ['not recorded', 'info'],
    ]);
    expect(waitingMailNotice([waiting, sent])).toMatch(/^The review e-mail to Robin Reviewer is waiting to be sent: .*recorded/);
  });

  it('shows no notice once every review e-mail has gone out', () => {
    expect(waitingMailNotice([sent, review('Old Request', null)])).toBeNull();
  });
});

describe('word-length apply', () => {
  const result = {
    coefficients: { minBits: 12, curve: [{ coefficientBits: 12, fractionBits: 10 }], note: null },
    data: { minBits: 9 },
  } as unknown as WordLengthResult;

  it('applies coefficient and data widths; "auto" fraction bits stay auto', () => {
    expect(widthEdits(result, mainsSyncSpec)).toEqual({ 'fixedPoint.coefficientBits': '12', 'fixedPoint.dataBits': '9' });
  });

  it('carries the fraction bits the search used when the Q format is explicit', () => {
    const spec = { ...mainsSyncSpec, fixedPoint: { ...mainsSyncSpec.fixedPoint, coefficientFractionBits: 14 } };
    expect(widthEdits(result, spec)).toMatchObject({ 'fixedPoint.coefficientFractionBits': '10' });
  });
});

describe('word-length curves', () => {
  // The dsp search itself on the mains demo, coefficients only (6..20 bits), so the curve is real.
  const real = wordLengthSearch(mainsSyncSpec, { minCoefficientBits: 6, maxCoefficientBits: 20, data: false, points: 200 });

  it('draws the three stacked charts on one x scale, with the cheapest width at that width on each', () => {
    const option = coefficientCurveOption(real) as { xAxis: { type: string; min: number; max: number }[]; series: { data: [number, unknown][]; markLine: { data: { xAxis?: number }[] } }[] };
    expect(option.xAxis.map((a) => [a.type, a.min, a.max])).toEqual([['value', 6, 20], ['value', 6, 20], ['value', 6, 20]]);
    for (const series of option.series) {
      expect(series.data.map((p) => p[0])).toEqual(real.coefficients.curve.map((p) => p.coefficientBits));
      expect(series.markLine.data.filter((d) => d.xAxis !== undefined).map((d) => d.xAxis)).toEqual([real.coefficients.minBits]);
    }
  });

  it('keeps the legend of the data-width chart away from the marker label above the grid', () => {
    const r = { ...real, data: { minBits: 10, curve: [8, 10, 12].map((dataBits) => ({ dataBits, steadyStatePhaseErrorDeg: 0.1, phaseJitterDeg: 0.2 })) } } as unknown as WordLengthResult;
    const option = dataCurveOption(r) as { legend: { top?: number; bottom?: number }; grid: { top: number }; xAxis: { type: string; min: number; max: number } };
    // Common practice, no source: a label drawn above a chart and a legend at the top of it collide.
    expect(option.legend.top).toBeUndefined();
    expect(option.legend.bottom).toBe(0);
    expect([option.xAxis.type, option.xAxis.min, option.xAxis.max]).toEqual(['value', 8, 12]);
  });

  it('draws no phase margin for a width whose quantised loop is unstable', () => {
    const option = coefficientCurveOption(real) as { series: { name: string; data: [number, number | null][] }[] };
    const pm = option.series.find((s) => s.name === 'Phase margin')!;
    for (const p of real.coefficients.curve) if (!p.stable) expect(pm.data.find((d) => d[0] === p.coefficientBits)![1]).toBeNull();
    expect(real.coefficients.curve.some((p) => !p.stable)).toBe(true);
  });

  it('states the widths to apply in the form labels, with a space and the unit', () => {
    expect(widthEditsText({ 'fixedPoint.coefficientBits': '17', 'fixedPoint.dataBits': '14' })).toBe('Coefficient width 17 bits, data width 14 bits');
  });

  it('gives every width tried a row saying why it passes or fails', () => {
    const rows = widthVerdictRows(real);
    expect(rows).toHaveLength(15);
    const failing = rows.filter((r) => r.result === 'fails');
    expect(failing.length).toBeGreaterThan(0);
    // 6-bit coefficients make the mains loop unstable (the margins test shows it too).
    expect(rows[0]).toMatchObject({ width: 'Coefficients 6 bits', result: 'fails' });
    expect(rows[0]!.reason).toMatch(/^Unstable/);
    for (const r of failing) expect(r.reason).toMatch(/^[A-Z].*\.$/);
    const cheapest = real.coefficients.minBits!;
    expect(rows.find((r) => r.width === `Coefficients ${cheapest} bits`)).toMatchObject({ result: 'passes', reason: 'Meets every criterion.' });
    // A width that passes below a failing wider one says why it is not the cheapest.
    for (const r of rows.filter((row) => row.result === 'passes' && Number(row.width.split(' ')[1]) < cheapest)) {
      expect(r.reason).toMatch(new RegExp(`but \\d+ bits fails, so the search does not take a width below ${cheapest} bits`));
    }
  });
});

describe('scenario form', () => {
  it('turns the FM presets into the fm kind with that modulation', () => {
    expect(draftToScenario('fm-square', { rateHz: '1', deviationHz: '2', durationS: '3' })).toEqual({ kind: 'fm', modulation: 'square', rateHz: 1, deviationHz: 2, durationS: 3 });
    expect(draftToScenario('noise', { offsetHz: '', durationS: '1', snrDb: '' })).toMatchObject({ kind: 'tone', offsetHz: 0, snrDb: 10 });
  });

  it('names the field the scenario schema refuses', () => {
    const check = checkScenario('phase-step', { stepDeg: '400', atS: '0.1', durationS: '1' });
    expect(check.scenario).toBeNull();
    expect(Object.keys(check.errors)).toEqual(['stepDeg']);
    expect(check.errors['stepDeg']).not.toMatch(/^stepDeg:/);
    // A sentence naming the field by its label, the bound with its unit (the phase-step limit is dsp's).
    expect(check.errors['stepDeg']).toBe('Step size must be at most 360°.');
  });
});

describe('audit filter', () => {
  const rows = auditRows([
    { id: 1, at: '2026-01-01T10:00:00Z', actorId: 1, actorEmail: 'designer@example.test', action: 'release.cut', objectType: 'release', objectId: '4', objectLabel: 'Mains sync PI loop v1', ip: '127.0.0.1', detail: { label: 'v1' } },
    { id: 2, at: '2026-01-01T11:00:00Z', actorId: null, actorEmail: null, action: 'demo.seed', objectType: 'organization', objectId: '1', objectLabel: null, ip: null, detail: null },
    {
      id: 3, at: '2026-01-01T12:00:00Z', actorId: 1, actorEmail: 'designer@example.test', action: 'design.update', objectType: 'design', objectId: '7', objectLabel: 'Mains sync PI loop', ip: null,
      detail: { baseRevision: 4, name: { from: 'Mains', to: 'Mains sync' }, specChanges: [{ field: 'centerHz', from: 50, to: 60 }, { field: 'fixedPoint.coefficientBits', from: 18, to: 17 }] },
    },
  ]);

  it('names objects as a reader does and writes details in words, spec changes by label with old and new values', () => {
    expect(rows[0]!.object).toBe('release Mains sync PI loop v1');
    expect(rows[1]!.object).toBe('organization 1');
    expect(rows[0]!.detail).toBe('Label: v1');
    expect(rows[2]!.detail).toBe('Base revision: 4; Name: Mains → Mains sync; NCO centre frequency: 50 → 60; Coefficient width: 18 → 17');
    expect(rows.map((r) => r.detail).join(' ')).not.toMatch(/[{}"]/);
  });

  it('matches text in actor, object and detail, and the action exactly', () => {
    expect(filterAudit(rows, { text: 'v1', action: '', objectType: '' }).map((r) => r.id)).toEqual([1]);
    expect(filterAudit(rows, { text: '', action: 'demo.seed', objectType: '' }).map((r) => r.id)).toEqual([2]);
    expect(filterAudit(rows, { text: 'system', action: '', objectType: 'organization' }).map((r) => r.id)).toEqual([2]);
  });
});

describe('redirect after sign-in', () => {
  it('goes back to a local path but never to another site', () => {
    expect(afterSignIn('/designs/3', ['designer'])).toBe('/designs/3');
    expect(afterSignIn('//evil.example/x', ['designer'])).toEqual({ name: 'projects' });
    expect(afterSignIn('https://evil.example', ['firmware'])).toEqual({ name: 'downloads' });
  });
});

describe('readable values beside fields', () => {
  it('adds an SI prefix to large and small Hz and s values only', async () => {
    const { SPEC_SECTIONS, readableValue } = await import('../src/form/specFields.ts');
    const field = (path: string) => SPEC_SECTIONS.flatMap((s) => s.fields).find((f) => f.path === path)!;
    expect(readableValue(field('clockHz'), '100000000')).toBe('= 100 MHz');
    expect(readableValue(field('filter.tau1S'), '0.00026')).toBe('= 260 µs');
    expect(readableValue(field('centerHz'), '50')).toBe('');
    expect(readableValue(field('nco.accumulatorBits'), '32000')).toBe('');
    expect(readableValue(field('clockHz'), 'fast')).toBe('');
  });
});
