import type { DataSource } from 'typeorm';
import type { z } from 'zod';
import type { projectCreateRequestSchema, ProjectListQuery, ProjectRecord, ProjectUpdateRequest } from '@loopwright/contract';
import { Project } from '../entities/index.ts';
import { notFound } from '../errors.ts';
import type { AuditActor, AuditService } from './audit.ts';

interface ProjectRow {
  id: number;
  name: string;
  description: string;
  archivedAt: Date | null;
  createdAt: Date;
  updatedAt: Date;
  designCount: string | number;
}

function toRecord(row: ProjectRow): ProjectRecord {
  return {
    id: Number(row.id),
    name: row.name,
    description: row.description,
    archived: row.archivedAt !== null,
    designCount: Number(row.designCount),
    createdAt: new Date(row.createdAt).toISOString(),
    updatedAt: new Date(row.updatedAt).toISOString(),
  };
}

type ProjectCreateRequest = z.output<typeof projectCreateRequestSchema>;

export class ProjectService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
  ) {}

  private selectRecords() {
    return this.dataSource
      .createQueryBuilder()
      .select(['p.id AS id', 'p.name AS name', 'p.description AS description', 'p.archivedAt AS archivedAt', 'p.createdAt AS createdAt', 'p.updatedAt AS updatedAt'])
      .addSelect('(SELECT COUNT(*) FROM designs d WHERE d.projectId = p.id)', 'designCount')
      .from(Project, 'p');
  }

  /**
   * The hottest read of the API (every Projects screen), so plain SQL on a composite index rather than
   * the query builder: the builder's per-call work halved the benchmark's throughput.
   */
  async list(organizationId: number, query: ProjectListQuery): Promise<ProjectRecord[]> {
    const archivedFilter = { false: ' AND p.archivedAt IS NULL', true: ' AND p.archivedAt IS NOT NULL', all: '' }[query.archived];
    const rows: ProjectRow[] = await this.dataSource.query(
      'SELECT p.id, p.name, p.description, p.archivedAt, p.createdAt, p.updatedAt, ' +
        '(SELECT COUNT(*) FROM designs d WHERE d.projectId = p.id) AS designCount ' +
        `FROM projects p WHERE p.organizationId = ?${archivedFilter} ORDER BY p.name, p.id`,
      [organizationId],
    );
    return rows.map(toRecord);
  }

  async get(organizationId: number, id: number): Promise<ProjectRecord> {
    const row = await this.selectRecords().where('p.id = :id AND p.organizationId = :organizationId', { id, organizationId }).getRawOne<ProjectRow>();
    if (!row) throw notFound('project');
    return toRecord(row);
  }

  /** Throws not_found unless the project exists in the organisation; `requireActive` refuses archived ones. */
  async assertInOrganization(organizationId: number, id: number): Promise<{ archived: boolean }> {
    const project = await this.dataSource.getRepository(Project).findOne({ where: { id, organizationId }, select: { id: true, archivedAt: true } });
    if (!project) throw notFound('project');
    return { archived: project.archivedAt !== null };
  }

  async create(organizationId: number, request: ProjectCreateRequest, actor: AuditActor & { id: number }): Promise<ProjectRecord> {
    const id = await this.dataSource.transaction(async (manager) => {
      const inserted = await manager.insert(Project, {
        organizationId,
        name: request.name,
        description: request.description,
        createdById: actor.id,
        archivedAt: null,
      });
      const newId = Number(inserted.identifiers[0]?.id);
      await this.audit.record(actor, { action: 'project.create', objectType: 'project', objectId: newId, detail: { name: request.name } }, manager);
      return newId;
    });
    return this.get(organizationId, id);
  }

  /** Rename, describe, archive (archived: true) or restore (archived: false). */
  async update(organizationId: number, id: number, request: ProjectUpdateRequest, actor: AuditActor): Promise<ProjectRecord> {
    await this.dataSource.transaction(async (manager) => {
      const project = await manager.findOneBy(Project, { id, organizationId });
      if (!project) throw notFound('project');
      const changes: Partial<Pick<Project, 'name' | 'description' | 'archivedAt'>> = {};
      if (request.name !== undefined) changes.name = request.name;
      if (request.description !== undefined) changes.description = request.description;
      if (request.archived !== undefined) changes.archivedAt = request.archived ? (project.archivedAt ?? new Date()) : null;
      await manager.update(Project, { id }, changes);
      const action = request.archived === true ? 'project.archive' : request.archived === false ? 'project.restore' : 'project.update';
      await this.audit.record(actor, { action, objectType: 'project', objectId: id, detail: { before: { name: project.name }, changes: request } }, manager);
    });
    return this.get(organizationId, id);
  }
}
