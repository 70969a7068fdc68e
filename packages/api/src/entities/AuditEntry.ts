import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/**
 * Append-only audit trail: the service only inserts, and database triggers (see the migration) refuse
 * UPDATE and DELETE. Actor e-mail is copied so an entry still reads right after the account changes.
 */
@Entity({ name: 'audit_entries' })
@Index('IDX_audit_object', ['objectType', 'objectId'])
@Index('IDX_audit_actor', ['actorId'])
@Index('IDX_audit_org', ['organizationId', 'id'])
export class AuditEntry {
  @PrimaryGeneratedColumn({ type: 'bigint', unsigned: true })
  id: string;

  @CreateDateColumn({ type: 'datetime', precision: 3, default: () => 'CURRENT_TIMESTAMP(3)' })
  at: Date;

  /** The organisation whose admins see the entry; null for events of no organisation (unknown e-mail). */
  @Column({ type: 'int', unsigned: true, nullable: true })
  organizationId: number | null;

  @Column({ type: 'int', unsigned: true, nullable: true })
  actorId: number | null;

  @Column({ type: 'varchar', length: 254, nullable: true })
  actorEmail: string | null;

  /** Dotted verb, e.g. "design.update", "session.sign-in-failed". */
  @Column({ type: 'varchar', length: 64 })
  action: string;

  @Column({ type: 'varchar', length: 32 })
  objectType: string;

  @Column({ type: 'varchar', length: 64, nullable: true })
  objectId: string | null;

  /** Client address as Express sees it (IPv6 text form fits in 45 characters). */
  @Column({ type: 'varchar', length: 45, nullable: true })
  ip: string | null;

  @Column({ type: 'longtext', nullable: true })
  detailJson: string | null;
}
