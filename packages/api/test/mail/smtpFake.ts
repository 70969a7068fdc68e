/**
 * A real SMTP server in the test process (smtp-server), listening on 127.0.0.1 port 0, that parses
 * every message it accepts (mailparser). Nothing leaves the machine.
 */
import type { AddressInfo } from 'node:net';
import { simpleParser, type ParsedMail } from 'mailparser';
import { SMTPServer } from 'smtp-server';

export interface ReceivedMail {
  readonly to: string[];
  readonly subject: string;
  readonly text: string;
}

export interface SmtpFake {
  readonly port: number;
  readonly mails: ReceivedMail[];
  /** Resolves once at least `count` mails have arrived (or rejects after timeoutMs). */
  waitFor(count: number, timeoutMs?: number): Promise<ReceivedMail[]>;
  close(): Promise<void>;
}

function addresses(mail: ParsedMail): string[] {
  const to = mail.to === undefined ? [] : Array.isArray(mail.to) ? mail.to : [mail.to];
  return to.flatMap((a) => a.value.map((v) => (v.address ?? '').toLowerCase()));
}

export async function startSmtpFake(port = 0): Promise<SmtpFake> {
  const mails: ReceivedMail[] = [];
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((mail) => {
          mails.push({ to: addresses(mail), subject: mail.subject ?? '', text: mail.text ?? '' });
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const address = (server as unknown as { server: { address(): AddressInfo } }).server.address();
  return {
    port: address.port,
    mails,
    async waitFor(count, timeoutMs = 10_000) {
      const start = Date.now();
      while (mails.length < count) {
        if (Date.now() - start > timeoutMs) throw new Error(`expected ${count} mails, got ${mails.length}`);
        await new Promise((r) => setTimeout(r, 20));
      }
      return mails;
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
