import type { DataSource, EntityManager } from 'typeorm';
import type { AuditEntryRecord, AuditQuery } from '@loopwright/contract';
import { AuditEntry, User } from '../entities/index.ts';

/** Who did something and from where; `null` actor for events without a signed-in person. */
export interface AuditActor {
  readonly id: number | null;
  readonly email: string | null;
  readonly ip: string | null;
  /** Whose admins see the entry; when left out it is the actor's organisation. */
  readonly organizationId?: number | null;
}

export interface AuditEvent {
  readonly action: string;
  readonly objectType: string;
  readonly objectId: string | number | null;
  readonly detail?: unknown;
}

function toRecord(entry: AuditEntry): AuditEntryRecord {
  return {
    id: Number(entry.id),
    at: entry.at.toISOString(),
    actorId: entry.actorId,
    actorEmail: entry.actorEmail,
    action: entry.action,
    objectType: entry.objectType,
    objectId: entry.objectId,
    ip: entry.ip,
    detail: entry.detailJson === null ? null : (JSON.parse(entry.detailJson) as unknown),
  };
}

/** The audit trail: insert and read only (triggers refuse UPDATE and DELETE on the table). */
export class AuditService {
  constructor(private readonly dataSource: DataSource) {}

  /** Pass the transaction's manager so the entry commits or rolls back with the change it records. */
  async record(actor: AuditActor, event: AuditEvent, manager: EntityManager = this.dataSource.manager): Promise<void> {
    let organizationId = actor.organizationId ?? null;
    if (actor.organizationId === undefined && actor.id !== null) {
      organizationId = (await manager.findOne(User, { where: { id: actor.id }, select: { organizationId: true } }))?.organizationId ?? null;
    }
    await manager.insert(AuditEntry, {
      organizationId,
      actorId: actor.id,
      actorEmail: actor.email,
      ip: actor.ip === null ? null : actor.ip.slice(0, 45),
      action: event.action,
      objectType: event.objectType,
      objectId: event.objectId === null ? null : String(event.objectId),
      detailJson: event.detail === undefined ? null : JSON.stringify(event.detail),
    });
  }

  /** Entries of one organisation, newest first. */
  async list(organizationId: number, query: AuditQuery): Promise<AuditEntryRecord[]> {
    const qb = this.dataSource
      .getRepository(AuditEntry)
      .createQueryBuilder('a')
      .where('a.organizationId = :organizationId', { organizationId })
      .orderBy('a.id', 'DESC')
      .limit(query.limit);
    if (query.objectType !== undefined) qb.andWhere('a.objectType = :objectType', { objectType: query.objectType });
    if (query.objectId !== undefined) qb.andWhere('a.objectId = :objectId', { objectId: query.objectId });
    if (query.actorId !== undefined) qb.andWhere('a.actorId = :actorId', { actorId: query.actorId });
    if (query.beforeId !== undefined) qb.andWhere('a.id < :beforeId', { beforeId: query.beforeId });
    return (await qb.getMany()).map(toRecord);
  }
}
