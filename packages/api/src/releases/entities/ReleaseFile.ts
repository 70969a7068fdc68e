import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { Release } from './Release.ts';

/**
 * One artifact of a release: name, size and SHA-256; the bytes are in the file store under that
 * SHA-256 (storage/fileStore.ts). Rows of releases cut before the store existed hold their bytes in
 * `content`. Insert-only (trigger-guarded).
 */
@Entity({ name: 'release_files' })
@Index('UQ_release_files_name', ['releaseId', 'name'], { unique: true })
export class ReleaseFile {
  @PrimaryGeneratedColumn({ type: 'int', unsigned: true })
  id: number;

  @Column({ type: 'int', unsigned: true })
  releaseId: number;

  @ManyToOne(() => Release, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'releaseId' })
  release: Relation<Release>;

  /** Order in the bundle: 0 is manifest.json. */
  @Column({ type: 'smallint', unsigned: true })
  position: number;

  @Column({ type: 'varchar', length: 80 })
  name: string;

  @Column({ type: 'varchar', length: 64 })
  mediaType: string;

  @Column({ type: 'int', unsigned: true })
  sizeBytes: number;

  @Column({ type: 'char', length: 64 })
  sha256: string;

  /** NULL: the bytes are in the file store (every release cut since it exists). */
  @Column({ type: 'longblob', nullable: true })
  content: Buffer | null;
}
