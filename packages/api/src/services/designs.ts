import { parseLoopSpec, type LoopSpec } from '@loopwright/dsp';
import type { DataSource, EntityManager } from 'typeorm';
import type { z } from 'zod';
import type { DesignDuplicateRequest, DesignListQuery, DesignRecord, DesignSummary, designCreateRequestSchema, designUpdateRequestSchema } from '@loopwright/contract';
import { Design } from '../entities/index.ts';
import { AppError, conflict, invalidInput, issuesError, notFound, staleRevision } from '../errors.ts';
import type { AuditActor, AuditService } from './audit.ts';
import type { ProjectService } from './projects.ts';
import { blankSpec, findTemplate } from './templates.ts';
import { specFieldChanges } from './specChanges.ts';

/**
 * Says why a design may not be deleted (e.g. "it has releases"), or null. The release module registers
 * one; a foreign key from its table to `designs` is the database's own second line of defence.
 */
export type DesignDeletionGuard = (designId: number, manager: EntityManager) => Promise<string | null>;

interface DesignRow {
  id: number;
  projectId: number;
  name: string;
  revision: number;
  ownerId: number;
  ownerName: string;
  archivedAt: Date | null;
  createdAt: Date;
  updatedAt: Date;
  specJson?: string;
}

function toSummary(row: DesignRow): DesignSummary {
  return {
    id: Number(row.id),
    projectId: Number(row.projectId),
    name: row.name,
    revision: Number(row.revision),
    ownerId: Number(row.ownerId),
    ownerName: row.ownerName,
    archived: row.archivedAt !== null,
    createdAt: new Date(row.createdAt).toISOString(),
    updatedAt: new Date(row.updatedAt).toISOString(),
  };
}

/**
 * A stored spec is validated again as it leaves the data layer: it went in valid, but only a parse
 * (not a cast) proves it still is under today's schema. One that fails is a fault of the data (a
 * schema made stricter without a migration), answered 500 naming the design and the field.
 */
function storedSpec(row: DesignRow): LoopSpec {
  const parsed = parseLoopSpec(JSON.parse(row.specJson ?? 'null'));
  if (parsed.ok) return parsed.spec;
  const first = parsed.issues[0];
  throw new AppError('internal', `the stored spec of design ${row.id} no longer passes validation (${first?.message ?? 'invalid'}); the database needs a migration to the current spec schema`, 500, first?.field ? `spec.${first.field}` : 'spec');
}

function toRecord(row: DesignRow): DesignRecord {
  return { ...toSummary(row), spec: storedSpec(row) };
}

type Actor = AuditActor & { id: number };
type DesignCreateRequest = z.output<typeof designCreateRequestSchema>;
type DesignUpdateRequest = z.output<typeof designUpdateRequestSchema>;

export class DesignService {
  private readonly deletionGuards: DesignDeletionGuard[] = [];

  constructor(
    private readonly dataSource: DataSource,
    private readonly projects: ProjectService,
    private readonly audit: AuditService,
  ) {}

  addDeletionGuard(guard: DesignDeletionGuard): void {
    this.deletionGuards.push(guard);
  }

  private select(manager: EntityManager, withSpec: boolean) {
    const qb = manager
      .createQueryBuilder()
      .select(['d.id AS id', 'd.projectId AS projectId', 'd.name AS name', 'd.revision AS revision', 'd.ownerId AS ownerId', 'u.displayName AS ownerName', 'd.archivedAt AS archivedAt', 'd.createdAt AS createdAt', 'd.updatedAt AS updatedAt'])
      .from(Design, 'd')
      .innerJoin('d.owner', 'u')
      .innerJoin('d.project', 'p');
    if (withSpec) qb.addSelect('d.specJson', 'specJson');
    return qb;
  }

  async list(organizationId: number, projectId: number, archived: DesignListQuery['archived'] = 'false'): Promise<DesignSummary[]> {
    await this.projects.assertInOrganization(organizationId, projectId);
    const qb = this.select(this.dataSource.manager, false).where('d.projectId = :projectId', { projectId });
    if (archived === 'false') qb.andWhere('d.archivedAt IS NULL');
    if (archived === 'true') qb.andWhere('d.archivedAt IS NOT NULL');
    const rows = await qb.orderBy('d.name', 'ASC').addOrderBy('d.id', 'ASC').getRawMany<DesignRow>();
    return rows.map(toSummary);
  }

  async get(organizationId: number, id: number, manager: EntityManager = this.dataSource.manager): Promise<DesignRecord> {
    const row = await this.select(manager, true).where('d.id = :id AND p.organizationId = :organizationId', { id, organizationId }).getRawOne<DesignRow>();
    if (!row) throw notFound('design');
    return toRecord(row);
  }

  private async assertWritableProject(organizationId: number, projectId: number): Promise<void> {
    const { archived } = await this.projects.assertInOrganization(organizationId, projectId);
    if (archived) throw conflict('the project is archived; restore it before changing its designs', 'projectId');
  }

  /** An archived design is kept as it is: restore it before changing or releasing it. */
  assertNotArchived(design: Pick<DesignRecord, 'archived'>, doing: string): void {
    if (design.archived) throw conflict(`the design is archived; restore it before ${doing}`, 'archived');
  }

  private async insert(projectId: number, name: string, spec: LoopSpec, actor: Actor, action: string, detail: unknown): Promise<number> {
    return this.dataSource.transaction(async (manager) => {
      const inserted = await manager.insert(Design, { projectId, name, specJson: JSON.stringify(spec), ownerId: actor.id, revision: 1 });
      const id = Number(inserted.identifiers[0]?.id);
      await this.audit.record(actor, { action, objectType: 'design', objectId: id, detail }, manager);
      return id;
    });
  }

  async create(organizationId: number, projectId: number, request: DesignCreateRequest, actor: Actor): Promise<DesignRecord> {
    await this.assertWritableProject(organizationId, projectId);
    let spec: LoopSpec;
    if (request.templateId !== undefined) {
      const template = findTemplate(request.templateId);
      if (!template) throw invalidInput('templateId', `no template '${request.templateId}' (GET /api/templates lists them)`);
      spec = template;
    } else if (request.spec !== undefined) {
      spec = this.validSpec(request.spec);
    } else {
      spec = blankSpec(request.name);
    }
    const source = request.templateId ?? (request.spec ? 'spec' : 'blank');
    const id = await this.insert(projectId, request.name, spec, actor, 'design.create', { projectId, name: request.name, source });
    return this.get(organizationId, id);
  }

  /** For specs from files: every issue is reported with the spec field it concerns. */
  validSpec(input: unknown, fieldPrefix = 'spec'): LoopSpec {
    const parsed = parseLoopSpec(input);
    if (parsed.ok) return parsed.spec;
    throw issuesError(parsed.issues, fieldPrefix);
  }

  async createFromFile(organizationId: number, projectId: number, fileText: string, title: string | undefined, actor: Actor, fileName = ''): Promise<DesignRecord> {
    await this.assertWritableProject(organizationId, projectId);
    let spec: LoopSpec;
    try {
      let json: unknown;
      try {
        // A byte-order mark is not part of the JSON (RFC 8259 §8.1 lets a parser ignore it); editors add one.
        json = JSON.parse(fileText.replace(/^\uFEFF/, ''));
      } catch (err) {
        throw invalidInput('file', `the file is not valid JSON: ${(err as Error).message}`);
      }
      spec = this.validSpec(json, 'file');
    } catch (err) {
      // A refused upload is part of the record too: who tried which file, and why it was refused.
      if (err instanceof AppError) {
        await this.audit.record(actor, { action: 'design.upload-rejected', objectType: 'project', objectId: projectId, detail: { fileName: fileName.slice(0, 255), sizeBytes: Buffer.byteLength(fileText), field: err.field ?? null, reason: err.message } });
      }
      throw err;
    }
    const name = title ?? spec.name;
    const id = await this.insert(projectId, name, spec, actor, 'design.upload', { projectId, name });
    return this.get(organizationId, id);
  }

  /** Compare-and-set on the revision in one UPDATE, so two processes cannot both win. */
  async update(organizationId: number, id: number, request: DesignUpdateRequest, actor: Actor): Promise<DesignRecord> {
    const before = await this.get(organizationId, id);
    await this.assertWritableProject(organizationId, before.projectId);
    this.assertNotArchived(before, 'editing it');
    const changes: Partial<Pick<Design, 'name' | 'specJson'>> = {};
    if (request.name !== undefined) changes.name = request.name;
    if (request.spec !== undefined) changes.specJson = JSON.stringify(request.spec);
    const updated = await this.dataSource.transaction(async (manager) => {
      const result = await manager
        .createQueryBuilder()
        .update(Design)
        .set({ ...changes, revision: () => 'revision + 1' })
        .where('id = :id AND revision = :baseRevision', { id, baseRevision: request.baseRevision })
        .execute();
      if (result.affected !== 1) return false;
      // Which spec fields changed, each with its old and new value (and the name, if renamed).
      const detail = {
        baseRevision: request.baseRevision,
        ...(changes.name !== undefined && changes.name !== before.name ? { name: { from: before.name, to: changes.name } } : {}),
        ...(request.spec !== undefined ? { specChanges: specFieldChanges(before.spec, request.spec) } : {}),
      };
      await this.audit.record(actor, { action: 'design.update', objectType: 'design', objectId: id, detail }, manager);
      return true;
    });
    const current = await this.get(organizationId, id);
    if (!updated) throw staleRevision(current, request.baseRevision, current.revision);
    return current;
  }

  async duplicate(organizationId: number, id: number, request: DesignDuplicateRequest, actor: Actor): Promise<DesignRecord> {
    const source = await this.get(organizationId, id);
    const projectId = request.projectId ?? source.projectId;
    await this.assertWritableProject(organizationId, projectId);
    const name = request.name ?? `${source.name} (copy)`.slice(0, 120);
    const newId = await this.insert(projectId, name, source.spec, actor, 'design.duplicate', { sourceId: id, sourceRevision: source.revision, projectId });
    return this.get(organizationId, newId);
  }

  /**
   * Archive (archived: true) or restore (false). Neither touches the spec or the revision, so an open
   * editor's next save is not refused as stale; archiving twice keeps the first time.
   */
  async setArchived(organizationId: number, id: number, archived: boolean, actor: Actor): Promise<DesignRecord> {
    const design = await this.get(organizationId, id);
    await this.assertWritableProject(organizationId, design.projectId);
    if (design.archived !== archived) {
      await this.dataSource.transaction(async (manager) => {
        await manager
          .createQueryBuilder()
          .update(Design)
          .set({ archivedAt: archived ? () => 'CURRENT_TIMESTAMP(3)' : null })
          .where('id = :id', { id })
          .execute();
        await this.audit.record(actor, { action: archived ? 'design.archive' : 'design.restore', objectType: 'design', objectId: id, detail: { name: design.name, projectId: design.projectId, revision: design.revision } }, manager);
      });
    }
    return this.get(organizationId, id);
  }

  async remove(organizationId: number, id: number, actor: Actor): Promise<void> {
    const design = await this.get(organizationId, id);
    await this.assertWritableProject(organizationId, design.projectId);
    await this.dataSource.transaction(async (manager) => {
      for (const guard of this.deletionGuards) {
        const reason = await guard(id, manager);
        if (reason !== null) throw conflict(`the design cannot be deleted: ${reason}`);
      }
      try {
        await manager.delete(Design, { id });
      } catch (err) {
        if ((err as { driverError?: { code?: string } }).driverError?.code === 'ER_ROW_IS_REFERENCED_2') {
          throw new AppError('conflict', 'the design cannot be deleted: other records (releases) refer to it', 409);
        }
        throw err;
      }
      await this.audit.record(actor, { action: 'design.delete', objectType: 'design', objectId: id, detail: { name: design.name, projectId: design.projectId, revision: design.revision } }, manager);
    });
  }
}
