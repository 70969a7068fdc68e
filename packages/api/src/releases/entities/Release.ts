import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import { Design } from '../../entities/Design.ts';
import { User } from '../../entities/User.ts';
import { RELEASE_STATES, type ReleaseState } from '@loopwright/contract';

/**
 * A cut release: v<number> of a design. Numbers come from the database (unique per design, taken
 * under a row lock on the design), never from memory. Everything but the review state is written once;
 * a trigger (see the migration) refuses any later change to the content columns.
 */
@Entity({ name: 'releases' })
@Index('UQ_releases_design_number', ['designId', 'number'], { unique: true })
export class Release {
  @PrimaryGeneratedColumn({ type: 'int', unsigned: true })
  id: number;

  @Column({ type: 'int', unsigned: true })
  designId: number;

  @ManyToOne(() => Design, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'designId' })
  design: Relation<Design>;

  @Column({ type: 'int', unsigned: true })
  number: number;

  @Column({ type: 'enum', enum: RELEASE_STATES, default: 'draft' })
  state: ReleaseState;

  /** The validated spec the server computed from. */
  @Column({ type: 'longtext' })
  specJson: string;

  /** The server's results (analysis, quantisation, NCO), as in the manifest. */
  @Column({ type: 'longtext' })
  resultsJson: string;

  @Column({ type: 'char', length: 64 })
  specSha256: string;

  /** SHA-256 of manifest.json, which lists the SHA-256 of every other file: the release's identity. */
  @Column({ type: 'char', length: 64 })
  manifestSha256: string;

  /** Design revision the release was cut from. */
  @Column({ type: 'int', unsigned: true })
  designRevision: number;

  /** Set when review is requested. */
  @Column({ type: 'int', unsigned: true, nullable: true })
  approvalsRequired: number | null;

  @Column({ type: 'int', unsigned: true })
  createdById: number;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'createdById' })
  createdBy: Relation<User>;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date;

  @Column({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  stateChangedAt: Date;
}
