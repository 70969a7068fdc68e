/**
 * The release diff against the generated files themselves: every constant, word type and table whose
 * declaration differs between the VHDL packages (or the C headers) of two renders must be a row of the
 * diff, with a label a reader understands. The files are the outside reference here: whatever the
 * firmware engineer would see by comparing the two packages by hand (common practice, no source).
 */
import { describe, expect, it } from 'vitest';
import { mainsSyncSpec } from '@loopwright/dsp';
import { releaseDiff, type DiffSide } from '../../src/releases/diff.ts';
import type { RenderedRelease } from '../../src/render/artifacts.ts';
import { renderRelease } from '../render/release.ts';

function text(r: RenderedRelease, name: string): string {
  const f = r.files.find((x) => x.name === name);
  if (!f) throw new Error(`no ${name}`);
  return Buffer.from(f.bytes).toString('utf8');
}

/** name -> declaration text of every VHDL constant and subtype (tables span lines up to their ';'). */
function vhdlDeclarations(source: string): Map<string, string> {
  const out = new Map<string, string>();
  for (const m of source.matchAll(/\b(?:constant|subtype) (\S+) (?::|is) ([^;]*);/g)) out.set(m[1]!, m[2]!);
  return out;
}

/** name -> value of every C macro, typedef and table (the include guard is no constant). */
function cDeclarations(source: string): Map<string, string> {
  const out = new Map<string, string>();
  for (const m of source.matchAll(/^#define (\S+) (.+)$/gm)) out.set(m[1]!, m[2]!);
  for (const m of source.matchAll(/^typedef (\S+) (\S+);$/gm)) out.set(m[2]!, m[1]!);
  for (const m of source.matchAll(/^static const \S+ (\S+)\[(\d+)\] = \{([^}]*)\};$/gm)) out.set(m[1]!, `${m[2]}:${m[3]}`);
  return out;
}

function changedNames(a: Map<string, string>, b: Map<string, string>): string[] {
  return [...new Set([...a.keys(), ...b.keys()])].filter((k) => a.get(k) !== b.get(k)).sort();
}

function side(id: number, label: string, r: RenderedRelease): DiffSide {
  const m = r.manifest;
  const analysis = m.results['analysis'] as { margins: { analog: unknown; discrete: unknown }; quantization: { loop: { margins: unknown } | null } };
  return {
    id,
    label,
    spec: m.spec,
    manifest: m,
    margins: { analog: analysis.margins.analog, discrete: analysis.margins.discrete, quantized: analysis.quantization.loop?.margins ?? null },
    acquisition: m.results['acquisition'],
  };
}

// v2 widens the coefficients from 18 to 20 bits: COEF_FRACTION_BITS goes 16 -> 18, NCO_GAIN_SHIFT
// 8 -> 10 and NCO_GAIN_CODE 67109 -> 268435, the change a firmware engineer must not half-apply
// (the new gain code with the old shift drives the NCO 4x too hard).
const v1 = renderRelease(mainsSyncSpec);
const v2 = renderRelease({ ...mainsSyncSpec, fixedPoint: { ...mainsSyncSpec.fixedPoint, coefficientBits: 20 } });
const diff = releaseDiff(side(1, 'v1', v1), side(2, 'v2', v2));
const constantRows = diff.sections.filter((s) => ['formats', 'widths', 'codes', 'tables'].includes(s.id)).flatMap((s) => s.rows);
const keys = new Set(constantRows.map((r) => r.key));

describe('release diff', () => {
  it('lists every VHDL constant and subtype whose declaration differs', () => {
    const changed = changedNames(vhdlDeclarations(text(v1, 'mains_sync_50hz_pkg.vhd')), vhdlDeclarations(text(v2, 'mains_sync_50hz_pkg.vhd')));
    expect(changed).toContain('MAINS_SYNC_50HZ_NCO_GAIN_SHIFT');
    expect(changed).toContain('MAINS_SYNC_50HZ_COEF_FRACTION_BITS');
    expect(changed.filter((n) => !keys.has(n))).toEqual([]);
  });

  it('lists every C macro, typedef and table whose value differs', () => {
    const changed = changedNames(cDeclarations(text(v1, 'mains_sync_50hz.h')), cDeclarations(text(v2, 'mains_sync_50hz.h')));
    expect(changed.length).toBeGreaterThan(5);
    expect(changed.filter((n) => !keys.has(n))).toEqual([]);
  });

  it('puts formats and widths first, with labels and units', () => {
    expect(diff.sections.map((s) => s.id).slice(0, 2)).toEqual(['formats', 'widths']);
    const widths = diff.sections.find((s) => s.id === 'widths')!.rows;
    expect(widths.find((r) => r.key === 'MAINS_SYNC_50HZ_COEF_FRACTION_BITS')).toEqual({
      key: 'MAINS_SYNC_50HZ_COEF_FRACTION_BITS',
      label: 'Coefficient fraction bits',
      unit: 'bits',
      before: '16',
      after: '18',
    });
    expect(widths.find((r) => r.key === 'MAINS_SYNC_50HZ_NCO_GAIN_SHIFT')).toMatchObject({ label: 'NCO gain shift (right)', unit: 'bits', before: '8', after: '10' });
    const codes = diff.sections.find((s) => s.id === 'codes')!.rows;
    expect(codes.find((r) => r.key === 'MAINS_SYNC_50HZ_NCO_GAIN_CODE')).toMatchObject({ label: 'NCO gain code', before: '67109 (signed 18 bits)', after: '268435 (signed 20 bits)' });
    const coef = diff.sections[0]!.rows.find((r) => r.key === 'mains_sync_50hz_coef_t')!;
    expect([coef.before, coef.after]).toEqual(['Q2.16, signed, 18 bits', 'Q2.18, signed, 20 bits']);
    for (const r of constantRows) expect(r.label).not.toBe(r.key);
  });

  it('states margins by name, unit and four significant digits', () => {
    const margins = diff.sections.find((s) => s.id === 'margins')!.rows;
    expect(margins.length).toBeGreaterThan(0);
    for (const r of margins) {
      expect(r.label).toMatch(/^(Gain crossover|Phase margin|Phase crossover|Gain margin), (analog prototype|discrete loop|quantised loop)$/);
      expect(['Hz', 'deg', 'dB']).toContain(r.unit);
      for (const v of [r.before, r.after]) if (v !== 'none') expect(v!.replace(/^-|\.|e.*$/g, '').replace(/^0+/, '').length).toBeLessThanOrEqual(4);
    }
  });

  it('is empty for a re-cut of the same spec', () => {
    const again = releaseDiff(side(1, 'v1', v1), side(2, 'v2', renderRelease(mainsSyncSpec)));
    expect(again.sections.flatMap((s) => s.rows)).toEqual([]);
  });
});

describe('release diff: acquisition', () => {
  // v3 raises the NCO gain 20 -> 25 Hz per unit. The PI filter is designed from its targets ωn, ζ, so
  // the estimates 2ζωn and 1.8ωn(ζ+1) (G3, B6) do not move; the nonlinear loop does (the ripple filter
  // now sits in a loop of higher gain), and the control word's range ±gainHzPerUnit, where the PI
  // loop's hold-in search stops, moves with it.
  const v3 = renderRelease({ ...mainsSyncSpec, nco: { ...mainsSyncSpec.nco, gainHzPerUnit: 25 } });
  const rows = (d: ReturnType<typeof releaseDiff>) => d.sections.find((s) => s.id === 'acquisition')!.rows;

  it('stores the measured figures in the release and lists each one that moved, measured and estimated', () => {
    const stored = v3.manifest.results['acquisition'] as { figures: { name: string; measured: { valueHz: number | null } }[] };
    expect(stored.figures.map((f) => f.name)).toEqual(['lock-in', 'pull-out', 'hold-in', 'pull-in']);
    const changed = rows(releaseDiff(side(1, 'v1', v1), side(3, 'v3', v3)));
    const keysOf = changed.map((r) => r.key);
    expect(keysOf).toContain('lockInHz.measured');
    expect(keysOf).not.toContain('lockInHz.estimate');
    const hold = changed.find((r) => r.key === 'holdInHz.measured')!;
    // The search limit is never reported as a figure: the row names the limit and its bracket.
    expect(hold.before).toMatch(/^not measured: control-range \(bracket 20 to none failed\)$/);
    expect(hold.after).toMatch(/^not measured: control-range \(bracket 25 to none failed\)$/);
  });

  it('has no acquisition rows when only the widths changed (the float loop measured is the same)', () => {
    expect(rows(diff)).toEqual([]);
  });

  it('says a release cut before the figures were stored has none', () => {
    const old = { ...side(1, 'v1', v1), acquisition: undefined };
    const r = rows(releaseDiff(old, side(3, 'v3', v3)));
    expect(r[0]).toMatchObject({ before: null });
    expect(r.find((x) => x.key === 'acquisition')).toMatchObject({ before: 'not stored in this release', after: null });
  });
});
