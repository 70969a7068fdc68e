import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { Release } from './Release.ts';

/**
 * The server's verification of a release's reference RTL, made after the cut by a background job
 * (../verification/): the testbenches' verdict under GHDL and Icarus and the yosys estimate. A row of
 * its own beside the immutable release (whose files and manifest never change); it is also the job:
 * queued at the cut, claimed by one API process with SELECT … FOR UPDATE SKIP LOCKED, done once.
 */
@Entity({ name: 'release_verifications' })
@Index('IDX_release_verifications_state', ['state', 'claimedAt'])
export class ReleaseVerification {
  @PrimaryGeneratedColumn({ type: 'int', unsigned: true })
  id: number;

  @Index('UQ_release_verifications_release', { unique: true })
  @Column({ type: 'int', unsigned: true })
  releaseId: number;

  @ManyToOne(() => Release, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'releaseId' })
  release: Relation<Release>;

  /** queued → running → done; a running claim older than the lease goes back to the queue. */
  @Column({ type: 'varchar', length: 16, default: 'queued' })
  state: 'queued' | 'running' | 'done';

  /** What the job is doing now, for the release page. */
  @Column({ type: 'varchar', length: 200, nullable: true })
  progress: string | null;

  @Column({ type: 'smallint', unsigned: true, default: 0 })
  attempts: number;

  /** The API process holding the job (host, pid, random), and when it last said so. */
  @Column({ type: 'varchar', length: 120, nullable: true })
  claimedBy: string | null;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  claimedAt: Date | null;

  /** The simulations' verdict (RtlVerdict); set as soon as they finish, before the estimate. */
  @Column({ type: 'varchar', length: 16, nullable: true })
  verdict: string | null;

  /** RtlVerification JSON (@loopwright/contract). */
  @Column({ type: 'longtext', nullable: true })
  verificationJson: string | null;

  /** ResourceEstimate JSON (@loopwright/contract). */
  @Column({ type: 'longtext', nullable: true })
  estimateJson: string | null;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  startedAt: Date | null;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  finishedAt: Date | null;
}
