import {
  Column,
  CreateDateColumn,
  Entity,
  Index,
  JoinColumn,
  ManyToOne,
  PrimaryGeneratedColumn,
  UpdateDateColumn,
  type Relation,
} from 'typeorm';
import { Project } from './Project.ts';
import { User } from './User.ts';

/** A loop design: the spec JSON (DESIGN.md) plus a title, an owner and an optimistic-lock revision. */
@Entity({ name: 'designs' })
@Index('IDX_designs_project', ['projectId'])
export class Design {
  @PrimaryGeneratedColumn({ type: 'int', unsigned: true })
  id: number;

  @Column({ type: 'int', unsigned: true })
  projectId: number;

  @ManyToOne(() => Project, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'projectId' })
  project: Relation<Project>;

  @Column({ type: 'varchar', length: 120 })
  name: string;

  /** The validated spec as JSON text; parsed and re-validated on the way out of the data layer. */
  @Column({ type: 'longtext' })
  specJson: string;

  @Column({ type: 'int', unsigned: true })
  ownerId: number;

  @ManyToOne(() => User, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'ownerId' })
  owner: Relation<User>;

  /**
   * An archived design leaves the default list and can no longer be edited or released; it is kept with
   * its releases (a design that has releases is never deleted). Restoring clears it.
   */
  @Column({ type: 'datetime', precision: 3, nullable: true })
  archivedAt: Date | null;

  /** Starts at 1, +1 on every accepted update (compare-and-set in one UPDATE). */
  @Column({ type: 'int', unsigned: true, default: 1 })
  revision: number;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  createdAt: Date;

  @UpdateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)', onUpdate: 'CURRENT_TIMESTAMP(3)' })
  updatedAt: Date;
}
