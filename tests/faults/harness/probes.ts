/** Small questions a fault test asks the running stack. */
import { createHash } from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import { expect } from 'vitest';
import { api } from '../../e2e/harness/api.ts';

/** The id of a demo design, found by its name through the project list. */
export async function designIdOf(baseUrl: string, cookie: string, designName: string): Promise<number> {
  const projects = await api<{ projects: { id: number }[] }>(baseUrl, '/api/projects', { cookie });
  for (const project of projects.body.projects) {
    const designs = await api<{ designs: { id: number; name: string }[] }>(baseUrl, `/api/projects/${project.id}/designs`, { cookie });
    const found = designs.body.designs.find((d) => d.name === designName);
    if (found) return found.id;
  }
  throw new Error(`no design named "${designName}"`);
}

/** Waits until every one of `processes` serving processes answers /api/health with 200 (the database is back for each). */
export async function healthyEverywhere(baseUrl: string, processes: number, timeoutMs = 60_000): Promise<void> {
  const healthy = new Set<string>();
  const deadline = Date.now() + timeoutMs;
  while (healthy.size < processes) {
    const health = await api(baseUrl, '/api/health').catch(() => undefined);
    if (health?.status === 200 && health.process) healthy.add(health.process);
    if (Date.now() > deadline) throw new Error(`only ${[...healthy].join(', ') || 'no process'} healthy after ${timeoutMs / 1000} s`);
    if (health?.status !== 200) await new Promise((resolve) => setTimeout(resolve, 200));
  }
}

/** Each serving process's own loopback port (behind nginx), read from the balancer's generated configuration. */
export async function backendPorts(dataDir: string): Promise<Map<string, number>> {
  const config = await fs.readFile(path.join(dataDir, 'server', 'balancer', 'nginx.conf'), 'utf8');
  const ports = new Map<string, number>();
  for (const match of config.matchAll(/server 127\.0\.0\.1:(\d+)/g)) {
    const port = Number(match[1]);
    const health = await api(`http://127.0.0.1:${port}`, '/api/health');
    if (health.process) ports.set(health.process, port);
  }
  return ports;
}

/** Resolves once the process has ended (a zombie counts: it runs no more). */
export async function gone(pid: number, timeoutMs = 10_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const stat = await fs.readFile(`/proc/${pid}/stat`, 'utf8').catch(() => '');
    if (stat === '' || stat.slice(stat.lastIndexOf(')') + 2)[0] === 'Z') return;
    if (Date.now() > deadline) throw new Error(`process ${pid} still runs after ${timeoutMs / 1000} s`);
    await new Promise((resolve) => setTimeout(resolve, 20));
  }
}

/**
 * Checks the release file store (src/storage/fileStore.ts layout): every stored file holds the bytes its
 * SHA-256 name says, and no temporary file is left half-written. Returns the stored names.
 */
export async function storeIsWhole(storeDir: string): Promise<string[]> {
  const names: string[] = [];
  const shaDir = path.join(storeDir, 'sha256');
  for (const prefix of await fs.readdir(shaDir)) {
    for (const name of await fs.readdir(path.join(shaDir, prefix))) {
      const bytes = await fs.readFile(path.join(shaDir, prefix, name));
      expect(createHash('sha256').update(bytes).digest('hex')).toBe(name);
      names.push(name);
    }
  }
  expect(await fs.readdir(path.join(storeDir, 'tmp'))).toEqual([]);
  return names.sort();
}
