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

function toRecord(entry: AuditEntry, labels: ReadonlyMap<string, string>): AuditEntryRecord {
  return {
    id: Number(entry.id),
    at: entry.at.toISOString(),
    actorId: entry.actorId,
    actorEmail: entry.actorEmail,
    action: entry.action,
    objectType: entry.objectType,
    objectId: entry.objectId,
    objectLabel: entry.objectId === null ? null : (labels.get(`${entry.objectType}:${entry.objectId}`) ?? null),
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
    const entries = await qb.getMany();
    const labels = await this.objectLabels(entries);
    return entries.map((e) => toRecord(e, labels));
  }

  /** What each object of a page of entries is called now, keyed "type:id", one query per object type. */
  private async objectLabels(entries: readonly AuditEntry[]): Promise<Map<string, string>> {
    const idsOf = (type: string) => [...new Set(entries.filter((e) => e.objectType === type && e.objectId !== null && /^\d+$/.test(e.objectId)).map((e) => Number(e.objectId)))];
    const queries: Readonly<Record<string, string>> = {
      design: 'SELECT id, name AS label FROM designs WHERE id IN (?)',
      project: 'SELECT id, name AS label FROM projects WHERE id IN (?)',
      user: 'SELECT id, email AS label FROM users WHERE id IN (?)',
      release: "SELECT r.id AS id, CONCAT(d.name, ' v', r.number) AS label FROM releases r JOIN designs d ON d.id = r.designId WHERE r.id IN (?)",
    };
    const labels = new Map<string, string>();
    for (const [type, sql] of Object.entries(queries)) {
      const ids = idsOf(type);
      if (ids.length === 0) continue;
      const rows: { id: number | string; label: string }[] = await this.dataSource.query(sql, [ids]);
      for (const row of rows) labels.set(`${type}:${row.id}`, row.label);
    }
    return labels;
  }
}
