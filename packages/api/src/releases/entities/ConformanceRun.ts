import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

export const CONFORMANCE_VERDICTS = ['bit-exact', 'mismatch'] as const;
export type ConformanceVerdict = (typeof CONFORMANCE_VERDICTS)[number];

/** One uploaded capture compared with a release's golden vectors, and its verdict. */
@Entity({ name: 'conformance_runs' })
@Index('IDX_conformance_runs_release', ['releaseId'])
export class ConformanceRun {
  @PrimaryGeneratedColumn({ type: 'int', unsigned: true })
  id: number;

  @Column({ type: 'int', unsigned: true })
  releaseId: number;

  @Column({ type: 'int', unsigned: true })
  uploadedById: number;

  /** The client's file name, kept as text for display only (never used as a path). */
  @Column({ type: 'varchar', length: 255 })
  fileName: string;

  @Column({ type: 'int', unsigned: true })
  sizeBytes: number;

  @Column({ type: 'char', length: 64 })
  sha256: string;

  @Column({ type: 'enum', enum: CONFORMANCE_VERDICTS })
  verdict: ConformanceVerdict;

  @Column({ type: 'int', unsigned: true })
  samplesCompared: number;

  @Column({ type: 'int', unsigned: true })
  mismatchCount: number;

  /** Up to ten {sampleIndex, column, expected, got}. */
  @Column({ type: 'longtext' })
  firstMismatchesJson: string;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date;
}
