/** Queries over the release tables, returning plain rows (records.ts). */
import type { DataSource, EntityManager } from 'typeorm';
import { Design } from '../entities/Design.ts';
import { Release, ReleaseFile, ReleaseReview } from './entities/index.ts';
import type { FileRow, ReleaseRow, ReviewRow } from './records.ts';

function releaseQuery(manager: EntityManager, withContent: boolean) {
  const qb = manager
    .createQueryBuilder()
    .select([
      'r.id AS id',
      'r.designId AS designId',
      'r.number AS number',
      'r.state AS state',
      'r.manifestSha256 AS manifestSha256',
      'r.specSha256 AS specSha256',
      'r.designRevision AS designRevision',
      'r.approvalsRequired AS approvalsRequired',
      'r.createdById AS createdById',
      'u.displayName AS createdByName',
      'r.createdAt AS createdAt',
      'r.stateChangedAt AS stateChangedAt',
      'd.name AS designName',
      'd.projectId AS projectId',
      'p.name AS projectName',
      'p.organizationId AS organizationId',
    ])
    .from(Release, 'r')
    .innerJoin('r.createdBy', 'u')
    .innerJoin(Design, 'd', 'd.id = r.designId')
    .innerJoin('d.project', 'p');
  if (withContent) qb.addSelect('r.specJson', 'specJson').addSelect('r.resultsJson', 'resultsJson');
  return qb;
}

/**
 * The transaction every change of a release's review state runs in. It locks the release row first
 * (findRelease with `lock`) and runs at READ COMMITTED, so each read after the lock sees what the
 * transactions that held the lock before it committed. Under MariaDB's default REPEATABLE READ, a
 * read made before the lock was granted would fix the snapshot, and a count of approvals would miss
 * the decisions committed meanwhile: three reviewers deciding at once would each count one.
 */
export function releaseStateTransaction<T>(dataSource: DataSource, work: (manager: EntityManager) => Promise<T>): Promise<T> {
  return dataSource.transaction('READ COMMITTED', work);
}

export async function findRelease(manager: EntityManager, organizationId: number, id: number, withContent = false, lock = false): Promise<ReleaseRow | undefined> {
  // The row lock is taken on the release row alone (the join would lock design, project and user too).
  if (lock) await manager.query('SELECT `id` FROM `releases` WHERE `id` = ? FOR UPDATE', [id]);
  return releaseQuery(manager, withContent).where('r.id = :id AND p.organizationId = :organizationId', { id, organizationId }).getRawOne<ReleaseRow>();
}

export async function listReleases(manager: EntityManager, organizationId: number, where: { designId?: number; projectId?: number; states?: readonly string[] }, withContent = false): Promise<ReleaseRow[]> {
  const qb = releaseQuery(manager, withContent).where('p.organizationId = :organizationId', { organizationId });
  if (where.designId !== undefined) qb.andWhere('r.designId = :designId', { designId: where.designId });
  if (where.projectId !== undefined) qb.andWhere('d.projectId = :projectId', { projectId: where.projectId });
  if (where.states !== undefined) qb.andWhere('r.state IN (:...states)', { states: where.states });
  return qb.orderBy('r.designId', 'ASC').addOrderBy('r.number', 'DESC').getRawMany<ReleaseRow>();
}

export async function listFiles(manager: EntityManager, releaseId: number): Promise<FileRow[]> {
  return manager
    .createQueryBuilder()
    .select(['f.name AS name', 'f.mediaType AS mediaType', 'f.sizeBytes AS sizeBytes', 'f.sha256 AS sha256'])
    .from(ReleaseFile, 'f')
    .where('f.releaseId = :releaseId', { releaseId })
    .orderBy('f.position', 'ASC')
    .getRawMany<FileRow>();
}

/** File rows with the bytes of rows cut before the file store existed (`content` NULL otherwise). */
export async function fileRowsWithContent(manager: EntityManager, releaseId: number, name?: string): Promise<(FileRow & { content: Buffer | null })[]> {
  const qb = manager
    .createQueryBuilder()
    .select(['f.name AS name', 'f.mediaType AS mediaType', 'f.sizeBytes AS sizeBytes', 'f.sha256 AS sha256', 'f.content AS content'])
    .from(ReleaseFile, 'f')
    .where('f.releaseId = :releaseId', { releaseId })
    .orderBy('f.position', 'ASC');
  if (name !== undefined) qb.andWhere('f.name = :name', { name });
  return qb.getRawMany<FileRow & { content: Buffer | null }>();
}

export async function listReviews(manager: EntityManager, releaseId: number): Promise<ReviewRow[]> {
  return manager
    .createQueryBuilder()
    .select([
      'v.id AS id',
      'v.reviewerId AS reviewerId',
      'u.displayName AS reviewerName',
      'v.decision AS decision',
      'v.comment AS comment',
      'v.usedAt AS usedAt',
      'v.expiresAt AS expiresAt',
      'v.mailId AS mailId',
      'm.sentAt AS mailSentAt',
      'm.attempts AS mailAttempts',
      'm.nextAttemptAt AS mailNextAttemptAt',
    ])
    .from(ReleaseReview, 'v')
    .innerJoin('v.reviewer', 'u')
    .leftJoin('v.mail', 'm')
    .where('v.releaseId = :releaseId', { releaseId })
    .orderBy('v.id', 'ASC')
    .getRawMany<ReviewRow>();
}
