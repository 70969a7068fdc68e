import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/**
 * Every e-mail is written here in the transaction of the change it reports, then delivered; a
 * failed delivery stays here and is retried with backoff, so no message is lost to an SMTP outage.
 * A delivered mail keeps only its record (recipient, subject, kind, when): its text is dropped.
 */
@Entity({ name: 'mail_outbox' })
@Index('IDX_mail_outbox_pending', ['sentAt', 'nextAttemptAt'])
export class OutboxMail {
  @PrimaryGeneratedColumn({ type: 'bigint', unsigned: true })
  id: string;

  @Column({ type: 'varchar', length: 254 })
  toAddress: string;

  @Column({ type: 'varchar', length: 255 })
  subject: string;

  /** The text until it is delivered; NULL after (a review link in it is a credential). */
  @Column({ type: 'longtext', nullable: true })
  textBody: string | null;

  /** What the mail is for, e.g. "review-request", "release-approved". */
  @Column({ type: 'varchar', length: 32 })
  kind: string;

  @Column({ type: 'int', unsigned: true, default: 0 })
  attempts: number;

  @Column({ type: 'varchar', length: 500, nullable: true })
  lastError: string | null;

  @Column({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  nextAttemptAt: Date;

  /** A sender holds a row until this time, so two processes never send the same mail at once. */
  @Column({ type: 'datetime', precision: 3, nullable: true })
  claimedUntil: Date | null;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  sentAt: Date | null;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date;
}
