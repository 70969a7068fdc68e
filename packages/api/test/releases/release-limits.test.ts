/**
 * Every spec the analysis accepts can be released, or is refused up front naming the field: the sine
 * table is limited to what firmware uses (16 address bits: 65,536 entries), every generated file is
 * bounded, and the bytes live in the content-addressed file store, not in MariaDB rows.
 */
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { ifFmDemodSpec, mainsSyncSpec } from '@loopwright/dsp';
import type request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkArtifactSize, MAX_ARTIFACT_BYTES } from '../../src/render/artifactFile.ts';
import { RenderInputError } from '../../src/render/compute.ts';
import { csrf } from '../helpers.ts';
import { binary, startHandoff, type Handoff } from './handoff.ts';

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');

let h: Handoff;
let projectId: number;

beforeAll(async () => {
  h = await startHandoff();
  projectId = (await h.designer.post('/api/projects').set(csrf).send({ name: 'Release limits' }).expect(201)).body.id;
});

afterAll(async () => {
  await h.close();
});

async function cut(spec: unknown, name: string): Promise<request.Response> {
  const design = await h.designer.post(`/api/projects/${projectId}/designs`).set(csrf).send({ name, spec }).expect(201);
  return h.designer.post(`/api/designs/${design.body.id}/releases`).set(csrf);
}

describe('spec limits set from what firmware uses', () => {
  it('refuses a sine table of more than 16 address bits in the analysis, naming nco.phaseBits', async () => {
    for (const phaseBits of [17, 18, 24]) {
      const spec = { ...mainsSyncSpec, nco: { ...mainsSyncSpec.nco, phaseBits } };
      const res = await h.designer.post('/api/analysis').set(csrf).send({ spec }).expect(400);
      expect(res.body.error.field).toBe('spec.nco.phaseBits');
      expect(res.body.error.message).toMatch(/16/);
    }
  });

  it('releases the largest tables the schema allows (16 address bits, 32-bit amplitude, 64-bit phase)', async () => {
    const spec = { ...mainsSyncSpec, name: 'widest_tables', nco: { ...mainsSyncSpec.nco, phaseBits: 16, amplitudeBits: 32, accumulatorBits: 64 }, fixedPoint: { ...mainsSyncSpec.fixedPoint, dataBits: 21 } };
    const res = await cut(spec, 'Widest tables');
    expect(res.status, res.text.slice(0, 300)).toBe(201);
    // Every file is bounded, with room to spare at the limits (the 65,536-sample vectors of these widths are
    // about 4.2 MB, the largest file a release can carry; the cap is 16 MiB).
    for (const f of res.body.files as { name: string; sizeBytes: number }[]) expect(f.sizeBytes, f.name).toBeLessThan(MAX_ARTIFACT_BYTES / 2);
    // The bytes are in the file store, not in the rows.
    const rows = (await h.dataSource.query('SELECT `name`, `sha256`, `sizeBytes`, `content` IS NULL AS outside FROM `release_files` WHERE `releaseId` = ?', [res.body.id])) as { name: string; sha256: string; sizeBytes: number; outside: number }[];
    expect(rows.map((r) => Number(r.outside))).toEqual(rows.map(() => 1));
    for (const f of rows) {
      const file = await h.designer.get(`/api/releases/${res.body.id}/files/${f.name}`).buffer(true).parse(binary).expect(200);
      expect(sha256(file.body), f.name).toBe(f.sha256);
      expect(file.body.length).toBe(Number(f.sizeBytes));
    }
  });

  it('releases an IF demodulator whose centre is 6.87e-5 Hz (the analysis accepts it)', async () => {
    const spec = { ...ifFmDemodSpec, centerHz: 6.87e-5 };
    await h.designer.post('/api/analysis').set(csrf).send({ spec }).expect(200);
    const res = await cut(spec, 'Tiny centre');
    expect(res.status, res.text.slice(0, 300)).toBe(201);
  });
});

describe('the bound on a generated file', () => {
  it('refuses a file over it, naming the spec field that sizes the tables', () => {
    expect(() => checkArtifactSize('x.vh', 2048, 1024)).toThrow(RenderInputError);
    expect(() => checkArtifactSize('x.vh', 2048, 1024)).toThrow(/^nco.phaseBits: x.vh would be 2048 bytes/);
    expect(() => checkArtifactSize('x.vh', 1024, 1024)).not.toThrow();
  });
});

describe('the file store', () => {
  it('never serves bytes that fail their SHA-256 check', async () => {
    const res = await cut(mainsSyncSpec, 'Corrupted on disk');
    expect(res.status).toBe(201);
    const readme = (res.body.files as { name: string; sha256: string }[]).find((f) => f.name === 'README.txt')!;
    const path = h.built.services.handoff.files.pathOf(readme.sha256);
    const original = readFileSync(path);
    const flipped = Buffer.from(original);
    flipped[10] = flipped[10]! ^ 0x20;
    writeFileSync(path, flipped);
    try {
      const bad = await h.designer.get(`/api/releases/${res.body.id}/files/README.txt`).expect(500);
      expect(bad.body.error.message).toMatch(/failed its SHA-256 check/);
      await h.designer.get(`/api/releases/${res.body.id}/bundle`).expect(500);
    } finally {
      writeFileSync(path, original);
    }
    await h.designer.get(`/api/releases/${res.body.id}/files/README.txt`).expect(200);
  });
});
