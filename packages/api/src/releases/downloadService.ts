/**
 * Downloads of single files and of the zip bundle. Each one is logged (who, which release, which
 * file, when, from where) in release_downloads and in the audit trail before the bytes go out.
 */
import type { Response } from 'express';
import type { DataSource, EntityManager } from 'typeorm';
import type { SessionUser } from '@loopwright/contract';
import { notFound } from '../errors.ts';
import { assertDesignName } from '../render/identifiers.ts';
import type { AuditService } from '../services/audit.ts';
import type { DownloadRecord } from '@loopwright/contract';
import { bundleFolder, writeBundle } from './bundle.ts';
import { ReleaseDownload } from './entities/index.ts';
import type { Actor, ReleaseService } from './releaseService.ts';

export const BUNDLE_NAME = 'bundle';

export class DownloadService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly releases: ReleaseService,
    private readonly audit: AuditService,
  ) {}

  private async log(manager: EntityManager, releaseId: number, fileName: string, user: Pick<SessionUser, 'id' | 'email'>, actor: Actor): Promise<void> {
    await manager.insert(ReleaseDownload, { releaseId, userId: user.id, userEmail: user.email, fileName, ip: actor.ip?.slice(0, 45) ?? null });
    await this.audit.record(actor, { action: 'release.download', objectType: 'release', objectId: releaseId, detail: { file: fileName } }, manager);
  }

  async sendFile(organizationId: number, releaseId: number, name: string, user: SessionUser, actor: Actor, res: Response): Promise<void> {
    const row = await this.releases.visibleRow(organizationId, releaseId, user);
    await this.send(row.id, name, user, actor, res);
  }

  /** A file read by a review link's reviewer (the link decided who may), logged under the reviewer. */
  async sendReviewFile(releaseId: number, name: string, reviewer: { id: number; email: string; organizationId: number }, ip: string | null, res: Response): Promise<void> {
    await this.send(releaseId, name, { id: reviewer.id, email: reviewer.email }, { id: reviewer.id, email: reviewer.email, ip, organizationId: reviewer.organizationId }, res);
  }

  private async send(releaseId: number, name: string, user: Pick<SessionUser, 'id' | 'email'>, actor: Actor, res: Response): Promise<void> {
    const [file] = await this.releases.fileBytes(releaseId, name);
    if (!file) throw notFound(`file ${name} of the release`);
    await this.dataSource.transaction((manager) => this.log(manager, releaseId, file.name, user, actor));
    res
      .status(200)
      .type(file.mediaType)
      .attachment(file.name)
      .set('X-Content-SHA256', file.sha256)
      .send(file.content);
  }

  async sendBundle(organizationId: number, releaseId: number, user: SessionUser, actor: Actor, res: Response): Promise<void> {
    const row = await this.releases.visibleRow(organizationId, releaseId, user, this.dataSource.manager, true);
    // Every file is read and checked before the first byte goes out, so a bad one is an error reply, not a cut zip.
    const files = await this.releases.fileBytes(row.id);
    await this.dataSource.transaction((manager) => this.log(manager, row.id, BUNDLE_NAME, user, actor));
    // The folder and file name come from the validated spec name, never from the design's free-text title.
    const specName = (JSON.parse(row.specJson ?? '{}') as { name?: string }).name ?? '';
    assertDesignName(specName);
    const folder = bundleFolder(specName, Number(row.number));
    res.status(200).type('application/zip').attachment(`${folder}.zip`);
    await writeBundle(res, folder, files.map((f) => ({ name: f.name, content: f.content })), new Date(row.createdAt));
  }

  async list(organizationId: number, releaseId: number, user: SessionUser): Promise<DownloadRecord[]> {
    const row = await this.releases.visibleRow(organizationId, releaseId, user);
    const rows = await this.dataSource.getRepository(ReleaseDownload).find({ where: { releaseId: row.id }, order: { id: 'DESC' }, take: 500 });
    return rows.map((d) => ({ id: Number(d.id), releaseId: d.releaseId, userId: d.userId, userEmail: d.userEmail, fileName: d.fileName, at: d.at.toISOString() }));
  }
}
