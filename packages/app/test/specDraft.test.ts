import { describe, expect, it } from 'vitest';
import { exampleSpecs, parseLoopSpec } from '@loopwright/dsp';
import { draftToSpec, parseNumberText, specToDraft } from '../src/form/specDraft.ts';
import { checkDraft } from '../src/form/specValidation.ts';

describe('spec draft', () => {
  it('round-trips every demo spec through the form text unchanged', () => {
    for (const example of exampleSpecs) {
      const original = parseLoopSpec(example.spec);
      const back = parseLoopSpec(draftToSpec(specToDraft(example.spec)));
      expect(back.ok && original.ok, example.id).toBe(true);
      if (back.ok && original.ok) expect(back.spec, example.id).toEqual(original.spec);
    }
  });

  it('reads engineering notation and keeps unreadable text for the schema to name', () => {
    expect(parseNumberText(' 1e6 ')).toBe(1_000_000);
    expect(parseNumberText('2.5e-4')).toBe(0.00025);
    expect(parseNumberText('')).toBeUndefined();
    expect(parseNumberText('fast')).toBe('fast');
  });

  it('puts the schema message on the field that is wrong and on no other', () => {
    const draft = { ...specToDraft(exampleSpecs[0]!.spec), clockHz: 'fast' };
    const check = checkDraft(draft);
    expect(check.spec).toBeNull();
    expect(Object.keys(check.errors)).toEqual(['clockHz']);
    expect(check.errors['clockHz']).toMatch(/number/i);
    expect(check.errors['clockHz']).not.toMatch(/^clockHz:/);
  });

  it('reports a cross-field rule on the field to change (loop rate above the clock)', () => {
    const draft = { ...specToDraft(exampleSpecs[0]!.spec), clockHz: '1000', sampleRateHz: '10000' };
    // Named by the form's labels, values with their units.
    expect(checkDraft(draft).errors['sampleRateHz']).toMatch(/^Loop update rate \(10 kHz\) exceeds fabric clock \(1 kHz\)/);
  });

  it('sends only the fields of the chosen filter kind and mode', () => {
    const draft = { ...specToDraft(exampleSpecs[0]!.spec), 'filter.kind': 'lag-lead', 'filter.mode': 'time-constants', 'filter.tau1S': '2.6e-4', 'filter.tau2S': '2.5e-4' };
    expect(draftToSpec(draft)['filter']).toEqual({ kind: 'lag-lead', tau1S: 0.00026, tau2S: 0.00025 });
    const auto = { ...draft, 'fixedPoint.coefficientFractionBits': 'AUTO' };
    expect((draftToSpec(auto)['fixedPoint'] as Record<string, unknown>)['coefficientFractionBits']).toBe('auto');
  });
});
