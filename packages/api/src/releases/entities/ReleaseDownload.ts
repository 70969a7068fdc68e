import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** Who downloaded which file of which release, and when. Insert-only. */
@Entity({ name: 'release_downloads' })
@Index('IDX_release_downloads_release', ['releaseId'])
export class ReleaseDownload {
  @PrimaryGeneratedColumn({ type: 'bigint', unsigned: true })
  id: string;

  @Column({ type: 'int', unsigned: true })
  releaseId: number;

  @Column({ type: 'int', unsigned: true })
  userId: number;

  @Column({ type: 'varchar', length: 254 })
  userEmail: string;

  /** A file name of the release, or "bundle" for the zip. */
  @Column({ type: 'varchar', length: 80 })
  fileName: string;

  @Column({ type: 'varchar', length: 45, nullable: true })
  ip: string | null;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  at: Date;
}
