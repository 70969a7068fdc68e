/** Shared set-up of the hand-off tests: an app whose mail goes to an in-process SMTP fake. */
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import type request from 'supertest';
import type { DataSource } from 'typeorm';
import type { BuiltApp } from '../../src/app.ts';
import { buildApp, createTestOrg, csrf, openDataSource, signedInAgent, type Agent, type TestOrg } from '../helpers.ts';
import { startSmtpFake, type SmtpFake } from '../mail/smtpFake.ts';

export const PUBLIC_URL = 'http://loopwright.example.test';

export interface Handoff {
  dataSource: DataSource;
  built: BuiltApp;
  smtp: SmtpFake;
  org: TestOrg;
  designer: Agent;
  close(): Promise<void>;
}

export async function startHandoff(env: Record<string, string> = {}): Promise<Handoff> {
  const smtp = await startSmtpFake();
  // The hand-off settings are read from the environment when the services are built.
  Object.assign(process.env, { LW_SMTP_HOST: '127.0.0.1', LW_SMTP_PORT: String(smtp.port), LW_OUTBOX_INTERVAL_MS: '0', LW_PUBLIC_URL: PUBLIC_URL, ...env });
  const dataSource = await openDataSource();
  const built = buildApp(dataSource);
  const org = await createTestOrg(dataSource);
  const designer = await signedInAgent(built.app, org.emails.designer);
  return {
    dataSource,
    built,
    smtp,
    org,
    designer,
    async close() {
      await built.close();
      await dataSource.destroy();
      await smtp.close();
    },
  };
}

/** A project with one design from a template; returns the design id. */
export async function designFromTemplate(designer: Agent, templateId = 'mains-sync'): Promise<number> {
  const project = await designer.post('/api/projects').set(csrf).send({ name: `Hand-off ${templateId}` }).expect(201);
  const design = await designer.post(`/api/projects/${project.body.id}/designs`).set(csrf).send({ name: `Design ${templateId}`, templateId }).expect(201);
  return design.body.id as number;
}

/** The token of the review link in a mail body. */
export function linkToken(text: string): string {
  const m = new RegExp(`${PUBLIC_URL.replace(/[.]/g, '\\.')}/review/([A-Za-z0-9_.-]+)`).exec(text);
  if (!m?.[1]) throw new Error(`no review link in: ${text}`);
  return m[1];
}

/** The app on a loopback port of its own, for requests that must truly run at the same moment (fetch). */
export async function listening(app: BuiltApp['app']): Promise<{ base: string; close(): Promise<void> }> {
  const server = createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  return {
    base: `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/** supertest's parser for binary bodies: the bytes as one Buffer. */
export function binary(res: request.Response, cb: (err: Error | null, body: Buffer) => void): void {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
}
