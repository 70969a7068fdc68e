/**
 * A scenario the loop rate cannot represent is the caller's mistake: 400 naming the scenario field,
 * never 500. A release whose golden-vector scenario the spec cannot run names the spec field to
 * change (the scenario is the server's, not the designer's).
 */
import { mainsSyncSpec } from '@loopwright/dsp';
import { describe, expect, it } from 'vitest';
import { csrf, designerWithProject, useTestApp } from './helpers.ts';

const t = useTestApp();

describe('simulation scenarios outside what the loop rate can represent', () => {
  it('answers 400 naming scenario.offsetHz for a tone at 6000 Hz off a 50 Hz centre at a 10 kHz loop rate', async () => {
    const { designer, projectId } = await designerWithProject(t, 'Scenario errors');
    const scenario = { kind: 'tone', offsetHz: 6000, durationS: 0.05 };
    const body = await designer.post('/api/simulations').set(csrf).send({ spec: mainsSyncSpec, scenario }).expect(400);
    expect(body.body.error).toMatchObject({ code: 'invalid_input', field: 'scenario.offsetHz' });
    expect(body.body.error.message).toMatch(/outside \(0, 5000\) Hz/);
    const design = await designer.post(`/api/projects/${projectId}/designs`).set(csrf).send({ name: 'Mains', templateId: 'mains-sync' }).expect(201);
    const stored = await designer.post(`/api/designs/${design.body.id}/simulations`).set(csrf).send({ scenario }).expect(400);
    expect(stored.body.error.field).toBe('scenario.offsetHz');
  });

  it('answers 400 naming scenario.deviationHz and scenario.stepHz for FM and steps that leave the band', async () => {
    const { designer } = await designerWithProject(t, 'Scenario errors 2');
    const fm = await designer.post('/api/simulations').set(csrf).send({ spec: mainsSyncSpec, scenario: { kind: 'fm', modulation: 'sine', rateHz: 1, deviationHz: 60, durationS: 0.05 } }).expect(400);
    expect(fm.body.error.field).toBe('scenario.deviationHz');
    const step = await designer.post('/api/simulations').set(csrf).send({ spec: mainsSyncSpec, scenario: { kind: 'frequency-step', stepHz: -80, atS: 0.01, durationS: 0.05 } }).expect(400);
    expect(step.body.error.field).toBe('scenario.stepHz');
  });
});

describe('a release whose golden-vector scenario the spec cannot run', () => {
  it('is refused with 400 naming nco.gainHzPerUnit, the spec field that sets the scenario offset', async () => {
    const { designer, projectId } = await designerWithProject(t, 'Golden scenario');
    // The golden tone sits 0.01·gainHzPerUnit above centerHz: 4990 + 20 Hz is past the 5 kHz Nyquist.
    const spec = { ...mainsSyncSpec, centerHz: 4990, nco: { ...mainsSyncSpec.nco, gainHzPerUnit: 2000 } };
    const analysis = await designer.post('/api/analysis').set(csrf).send({ spec }).expect(200);
    expect(analysis.body.analysis.verdict.stable).toBe(true);
    const design = await designer.post(`/api/projects/${projectId}/designs`).set(csrf).send({ name: 'Near Nyquist', spec }).expect(201);
    const cut = await designer.post(`/api/designs/${design.body.id}/releases`).set(csrf).expect(400);
    expect(cut.body.error.field).toBe('spec.nco.gainHzPerUnit');
    expect(cut.body.error.message).toMatch(/golden-vector/);
  });
});
