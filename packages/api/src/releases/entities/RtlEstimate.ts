import { Column, CreateDateColumn, Entity, Index, PrimaryColumn } from 'typeorm';

/**
 * A yosys resource estimate, cached by the SHA-256 of what is synthesised (the Verilog sources and the
 * yosys version line): the same RTL is synthesised once, whichever process asks. A row asked for by
 * the word-length search starts `queued` with its sources and is claimed by one API process's worker
 * (SELECT … FOR UPDATE SKIP LOCKED), like a release verification; a verification that needs the same
 * estimate makes it itself and fills the row.
 */
@Entity({ name: 'rtl_estimates' })
@Index('IDX_rtl_estimates_state', ['state', 'claimedAt'])
export class RtlEstimate {
  @PrimaryColumn({ type: 'char', length: 64 })
  contentSha256: string;

  @Column({ type: 'varchar', length: 16, default: 'done' })
  state: 'queued' | 'running' | 'done';

  /** The sources to synthesise while queued (JSON: files, modules, top); cleared when done. */
  @Column({ type: 'longtext', nullable: true })
  sourcesJson: string | null;

  /** ResourceEstimate JSON (@loopwright/contract), once done. */
  @Column({ type: 'longtext', nullable: true })
  estimateJson: string | null;

  @Column({ type: 'varchar', length: 120, nullable: true })
  claimedBy: string | null;

  @Column({ type: 'datetime', precision: 3, nullable: true })
  claimedAt: Date | null;

  @Column({ type: 'smallint', unsigned: true, default: 0 })
  attempts: number;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date;
}
