/**
 * In-process SMTP fake on 127.0.0.1 (port 0): keeps every message it receives, parsed, so a test
 * can read the review link out of the mail the API sent. smtp-server and mailparser are the API
 * package's dev dependencies, so they are resolved from there.
 */
import { createRequire } from 'node:module';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import { ROOT } from './paths.ts';

const requireFromApi = createRequire(path.join(ROOT, 'packages', 'api', 'package.json'));

export interface CaughtMail {
  readonly to: string[];
  readonly subject: string;
  readonly text: string;
  readonly html: string;
}

export interface SmtpFake {
  readonly port: number;
  readonly messages: CaughtMail[];
  /** Resolves with the first message (now or later) that matches. */
  waitFor(match: (mail: CaughtMail) => boolean, timeoutMs?: number): Promise<CaughtMail>;
  stop(): Promise<void>;
}

interface SmtpServerCtor {
  new (options: Record<string, unknown>): {
    listen(port: number, host: string, cb: () => void): void;
    server: { address(): AddressInfo | string | null };
    close(cb: () => void): void;
  };
}

/** Listens on `port` (0: a free one), so a test can stop the relay and bring it back where the API expects it. */
export async function startSmtpFake(port = 0): Promise<SmtpFake> {
  const { SMTPServer } = requireFromApi('smtp-server') as { SMTPServer: SmtpServerCtor };
  const { simpleParser } = requireFromApi('mailparser') as {
    simpleParser(stream: NodeJS.ReadableStream): Promise<{ to?: unknown; subject?: string; text?: string; html?: string | false }>;
  };
  const messages: CaughtMail[] = [];
  const waiters: { match: (m: CaughtMail) => boolean; resolve: (m: CaughtMail) => void }[] = [];
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    onData(stream: NodeJS.ReadableStream, _session: unknown, callback: (err?: Error) => void) {
      simpleParser(stream)
        .then((parsed) => {
          const mail: CaughtMail = {
            to: addresses(parsed.to),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : '',
          };
          messages.push(mail);
          for (const w of waiters.filter((x) => x.match(mail))) {
            waiters.splice(waiters.indexOf(w), 1);
            w.resolve(mail);
          }
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  await new Promise<void>((resolve) => server.listen(port, '127.0.0.1', resolve));
  return {
    port: (server.server.address() as AddressInfo).port,
    messages,
    waitFor(match, timeoutMs = 20_000) {
      const found = messages.find(match);
      if (found) return Promise.resolve(found);
      return new Promise((resolve, reject) => {
        const timer = setTimeout(() => reject(new Error(`no matching mail within ${timeoutMs} ms (${messages.length} caught)`)), timeoutMs);
        waiters.push({ match, resolve: (m) => (clearTimeout(timer), resolve(m)) });
      });
    },
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

function addresses(to: unknown): string[] {
  const list = Array.isArray(to) ? to : to ? [to] : [];
  return list.flatMap((entry: { value?: { address?: string }[] }) => (entry.value ?? []).map((v) => v.address ?? ''));
}
