/**
 * The mail outbox. `enqueue` writes a message in the caller's transaction (so it exists exactly when
 * the change it reports committed); `deliverPending` sends what is due, each row claimed first with a
 * compare-and-set so several API processes never send one mail twice; a failure stays in the table
 * with an exponential backoff. `startTimer` runs the retry periodically (disabled with 0 in tests).
 * A delivered row keeps recipient, subject, kind and time, not the text.
 */
import type { DataSource, EntityManager } from 'typeorm';
import type { Transporter } from 'nodemailer';
import { OutboxMail } from '../releases/entities/index.ts';

export interface MailMessage {
  readonly to: string;
  readonly subject: string;
  readonly text: string;
  readonly kind: string;
}

export interface DeliveryReport {
  readonly sent: number;
  readonly failed: number;
}

const CLAIM_S = 60;
const MAX_BACKOFF_S = 3600;

/** 30 s, 60 s, 120 s … (from `firstRetryS`) capped at an hour: a down relay is not hammered, a short outage heals fast. */
export function backoffS(attempts: number, firstRetryS = 30): number {
  return Math.min(MAX_BACKOFF_S, firstRetryS * 2 ** Math.max(0, attempts - 1));
}

export class MailOutbox {
  constructor(
    private readonly dataSource: DataSource,
    private readonly transport: Transporter,
    private readonly from: string,
    /** Delay before the first retry of a failed delivery (LW_OUTBOX_FIRST_RETRY_S); doubles after each failure. */
    private readonly firstRetryS = 30,
  ) {}

  async enqueue(manager: EntityManager, messages: readonly MailMessage[]): Promise<string[]> {
    const ids: string[] = [];
    for (const m of messages) {
      const result = await manager.insert(OutboxMail, { toAddress: m.to, subject: m.subject.slice(0, 255), textBody: m.text, kind: m.kind });
      ids.push(String(result.identifiers[0]?.id));
    }
    return ids;
  }

  /** Sends every due message (or only `ids`, right after the commit that wrote them). Never throws for SMTP. */
  async deliverPending(ids?: readonly string[]): Promise<DeliveryReport> {
    const repo = this.dataSource.getRepository(OutboxMail);
    const qb = repo
      .createQueryBuilder('m')
      .select('m.id', 'id')
      .where('m.sentAt IS NULL')
      .andWhere('m.nextAttemptAt <= CURRENT_TIMESTAMP(3)')
      .andWhere('(m.claimedUntil IS NULL OR m.claimedUntil < CURRENT_TIMESTAMP(3))')
      .orderBy('m.id', 'ASC')
      .limit(100);
    if (ids !== undefined) {
      if (ids.length === 0) return { sent: 0, failed: 0 };
      qb.andWhere('m.id IN (:...ids)', { ids });
    }
    const due = await qb.getRawMany<{ id: string }>();
    let sent = 0;
    let failed = 0;
    for (const { id } of due) {
      const outcome = await this.deliverOne(String(id));
      if (outcome === 'sent') sent++;
      else if (outcome === 'failed') failed++;
    }
    return { sent, failed };
  }

  private async deliverOne(id: string): Promise<'sent' | 'failed' | 'skipped'> {
    const claim = await this.dataSource.query(
      'UPDATE `mail_outbox` SET `claimedUntil` = CURRENT_TIMESTAMP(3) + INTERVAL ? SECOND ' +
        'WHERE `id` = ? AND `sentAt` IS NULL AND (`claimedUntil` IS NULL OR `claimedUntil` < CURRENT_TIMESTAMP(3))',
      [CLAIM_S, id],
    );
    if (Number((claim as { affectedRows?: number }).affectedRows ?? 0) !== 1) return 'skipped';
    const mail = await this.dataSource.getRepository(OutboxMail).findOneByOrFail({ id });
    try {
      await this.transport.sendMail({ from: this.from, to: mail.toAddress, subject: mail.subject, text: mail.textBody ?? '' });
      // The text is dropped once delivered: a review link in it is a credential (stored hashed elsewhere).
      await this.dataSource.query(
        'UPDATE `mail_outbox` SET `sentAt` = CURRENT_TIMESTAMP(3), `claimedUntil` = NULL, `attempts` = `attempts` + 1, `lastError` = NULL, `textBody` = NULL WHERE `id` = ?',
        [id],
      );
      return 'sent';
    } catch (err) {
      const attempts = mail.attempts + 1;
      await this.dataSource.query(
        'UPDATE `mail_outbox` SET `attempts` = ?, `lastError` = ?, `claimedUntil` = NULL, ' +
          '`nextAttemptAt` = CURRENT_TIMESTAMP(3) + INTERVAL ? SECOND WHERE `id` = ?',
        [attempts, String((err as Error).message ?? err).slice(0, 500), backoffS(attempts, this.firstRetryS), id],
      );
      return 'failed';
    }
  }

  /** Periodic retry; returns a stop function. intervalMs 0 starts nothing. */
  startTimer(intervalMs: number, onError: (err: unknown) => void = () => {}): () => void {
    if (intervalMs <= 0) return () => {};
    let running = false;
    const timer = setInterval(() => {
      if (running) return;
      running = true;
      this.deliverPending()
        .catch(onError)
        .finally(() => {
          running = false;
        });
    }, intervalMs);
    timer.unref();
    return () => clearInterval(timer);
  }
}
