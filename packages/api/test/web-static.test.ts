import fs from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { serveWebApp } from '../src/web/static.ts';
import { useTestApp } from './helpers.ts';

const testApp = useTestApp();
let distDir: string;

beforeAll(async () => {
  distDir = await fs.mkdtemp(path.join(os.tmpdir(), 'lw-dist-'));
  await fs.mkdir(path.join(distDir, 'assets'));
  await fs.writeFile(path.join(distDir, 'index.html'), '<!doctype html><title>Loopwright</title><div id="app"></div>');
  await fs.writeFile(path.join(distDir, 'assets', 'main.js'), 'console.log("app");');
  expect(serveWebApp(testApp.built.app, distDir)).toBe(true);
});

afterAll(async () => {
  await fs.rm(distDir, { recursive: true, force: true });
});

describe('serving the testApp.built web app', () => {
  it('serves files of the build', async () => {
    const response = await request(testApp.built.app).get('/assets/main.js').expect(200);
    expect(response.text).toContain('console.log');
  });

  it('answers app routes with index.html (SPA fallback)', async () => {
    const response = await request(testApp.built.app).get('/projects/3/designs/7').expect(200);
    expect(response.headers['content-type']).toMatch(/text\/html/);
    expect(response.text).toContain('<div id="app">');
  });

  it('keeps unknown /api paths as JSON 404s, never the app page', async () => {
    const response = await request(testApp.built.app).get('/api/unknown/thing').expect(404);
    expect(response.body.error.code).toBe('not_found');
    await request(testApp.built.app).get('/api').expect(404);
  });

  it('sends a CSP that keeps scripts same-origin, lets the worker compile WebAssembly, and does not force HTTPS on a plain-HTTP deployment', async () => {
    const csp = String((await request(testApp.built.app).get('/projects')).headers['content-security-policy']);
    // 'wasm-unsafe-eval' allows WebAssembly compilation only (CSP Level 3), not 'unsafe-eval' of script text.
    expect(csp).toMatch(/script-src 'self' 'wasm-unsafe-eval'(;|$)/);
    expect(csp).not.toMatch(/'unsafe-eval'/);
    expect(csp).not.toMatch(/upgrade-insecure-requests/);
  });

  it('reports false when there is no build', () => {
    expect(serveWebApp(testApp.built.app, path.join(distDir, 'missing'))).toBe(false);
  });
});
