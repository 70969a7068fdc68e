import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { User } from '../../entities/User.ts';
import { OutboxMail } from './OutboxMail.ts';
import { Release } from './Release.ts';

export const REVIEW_DECISIONS = ['approve', 'request-changes'] as const;
export type ReviewDecision = (typeof REVIEW_DECISIONS)[number];

/**
 * A named reviewer of a release and the single-use link e-mailed to them. Only the token's hash is
 * stored (releases/reviewToken.ts); `selector` finds the row, the hash proves the secret.
 */
@Entity({ name: 'release_reviews' })
@Index('UQ_release_reviews_reviewer', ['releaseId', 'reviewerId'], { unique: true })
@Index('UQ_release_reviews_selector', ['selector'], { unique: true })
export class ReleaseReview {
  @PrimaryGeneratedColumn({ type: 'int', unsigned: true })
  id: number;

  @Column({ type: 'int', unsigned: true })
  releaseId: number;

  @ManyToOne(() => Release, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'releaseId' })
  release: Relation<Release>;

  @Column({ type: 'int', unsigned: true })
  reviewerId: number;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'reviewerId' })
  reviewer: Relation<User>;

  @Column({ type: 'int', unsigned: true })
  requestedById: number;

  @Column({ type: 'char', length: 12 })
  selector: string;

  @Column({ type: 'char', length: 64 })
  tokenHash: string;

  /** The release's manifest hash the link is bound to. */
  @Column({ type: 'char', length: 64 })
  manifestSha256: string;

  @Column({ type: 'datetime', precision: 3 })
  expiresAt: Date;

  /** Set when the link decides; a second use is refused as replayed. */
  @Column({ type: 'datetime', precision: 3, nullable: true })
  usedAt: Date | null;

  @Column({ type: 'enum', enum: REVIEW_DECISIONS, nullable: true })
  decision: ReviewDecision | null;

  @Column({ type: 'text', nullable: true })
  comment: string | null;

  /** The review-request mail in the outbox, so the release page can say whether it went out. */
  @Column({ type: 'bigint', unsigned: true, nullable: true })
  mailId: string | null;

  @ManyToOne(() => OutboxMail, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'mailId' })
  mail: Relation<OutboxMail> | null;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date;
}
