/**
 * Cutting and reading releases. A cut recomputes everything from the design's stored spec with
 * packages/dsp (render/compute.ts), renders every artifact (render/artifacts.ts, the same function
 * as `loopwright render`), and stores spec, results and bytes with their SHA-256 in one transaction.
 * The number is taken under a row lock on the design (SELECT … FOR UPDATE), so concurrent cuts queue
 * and never collide; the unique (designId, number) index is the database's second line of defence.
 */
import type { DataSource, EntityManager } from 'typeorm';
import type { DesignListItem, DesignListQuery, DesignRecord, SessionUser } from '@loopwright/contract';
import { AppError, conflict, invalidInput, issuesError, notFound } from '../errors.ts';
import type { AuditActor, AuditService } from '../services/audit.ts';
import type { DesignService } from '../services/designs.ts';
import { MANIFEST_FILE, stampRelease, type Manifest, type RenderedRelease } from '../render/artifacts.ts';
import { CAUTION } from '../render/caution.ts';
import { sha256Hex } from '../render/digest.ts';
import { StoredFileError, type FileStore } from '../storage/fileStore.ts';
import type { ComputePool } from '../services/compute.ts';
import { asBuffer } from '../render/artifactFile.ts';
import type { ReleaseDiff, ReleaseRecord, ReleaseSummary, ReleaseVerificationRecord } from '@loopwright/contract';
import { releaseDiff } from './diff.ts';
import { Release, ReleaseFile } from './entities/index.ts';
import { releaseLabel, toFileRecord, toReviewRecord, toSummary, type FileRow, type ReleaseRow } from './records.ts';
import { releaseFileBytes } from './fileBytes.ts';
import { findRelease, listFiles, listReleases, listReviews, releaseStateTransaction } from './repository.ts';
import type { ReleaseEvent } from '@loopwright/contract';
import { allowedEvents, transition } from './stateMachine.ts';
import { canSee, FIRMWARE_VISIBLE_STATES, seesAllStates } from './visibility.ts';
import type { VerificationService } from './verificationService.ts';

export type Actor = AuditActor & { id: number };

/** The reason the withdrawal recorded in the audit trail (the one place it is kept), or null. */
async function withdrawalReason(manager: EntityManager, releaseId: number): Promise<string | null> {
  const rows = (await manager.query(
    "SELECT `detailJson` FROM `audit_entries` WHERE `objectType` = 'release' AND `objectId` = ? AND `action` = 'release.withdraw' ORDER BY `id` DESC LIMIT 1",
    [String(releaseId)],
  )) as { detailJson: string | null }[];
  const detail = rows[0]?.detailJson ? (JSON.parse(rows[0].detailJson) as { reason?: unknown }) : null;
  return typeof detail?.reason === 'string' && detail.reason !== '' ? detail.reason : null;
}

/**
 * Waits for every promise, then rejects with the first failure, if any. Unlike Promise.all it never
 * settles while work is still running: a transaction rolled back while one of its inserts was still
 * queued on the connection would let that insert run after the rollback, on its own.
 */
async function allSettledOrThrow<T extends readonly unknown[]>(work: { readonly [K in keyof T]: Promise<T[K]> }): Promise<T> {
  const settled = await Promise.allSettled(work);
  const failed = settled.find((s) => s.status === 'rejected');
  if (failed) throw failed.reason;
  return settled.map((s) => (s as PromiseFulfilledResult<unknown>).value) as unknown as T;
}

/** A rendered release as it comes back from a worker thread, its bytes as Buffers again. */
function fromWorker(r: RenderedRelease): RenderedRelease {
  return { ...r, files: r.files.map((f) => ({ ...f, bytes: asBuffer(f.bytes) })) };
}

/** The design as an approved release holds it: its spec, the revision it was cut from, when it was cut. */
function asApproved(design: DesignRecord, release: ReleaseRow): DesignRecord {
  return { ...design, spec: JSON.parse(release.specJson ?? 'null') as DesignRecord['spec'], revision: Number(release.designRevision), updatedAt: new Date(release.createdAt).toISOString() };
}

interface StoredResults {
  analysis?: { margins?: { analog?: unknown; discrete?: unknown }; quantization?: { loop?: { margins?: unknown } | null } };
}

/** Margins of the analog prototype, the discrete loop and the loop with quantised coefficients. */
function marginsOf(results: StoredResults | null): unknown {
  const a = results?.analysis;
  return { analog: a?.margins?.analog ?? null, discrete: a?.margins?.discrete ?? null, quantized: a?.quantization?.loop?.margins ?? null };
}

export class ReleaseService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly designs: DesignService,
    private readonly audit: AuditService,
    private readonly files: FileStore,
    private readonly compute: ComputePool,
    readonly verification: VerificationService,
  ) {}

  async cut(organizationId: number, designId: number, actor: Actor): Promise<ReleaseRecord> {
    const design = await this.designs.get(organizationId, designId);
    this.designs.assertNotArchived(design, 'cutting a release of it');
    const id = await this.store(design, await this.render(design.spec), actor);
    this.verification.wake();
    return this.getForUser(organizationId, id, { roles: ['designer'] });
  }

  /**
   * Recompute and render a stored spec in the compute pool (a big sine table takes seconds, which
   * must not hold the event loop); a spec the server cannot turn into artifacts is the designer's to
   * fix (400 naming the field).
   */
  async render(spec: unknown): Promise<RenderedRelease> {
    const outcome = await this.compute.run({ kind: 'release', spec });
    if (!outcome.ok) throw issuesError(outcome.issues, 'spec');
    if (outcome.kind !== 'release') throw new Error('compute pool answered a release render with another kind');
    return fromWorker(outcome.rendered);
  }

  /**
   * Stores a rendered release as the design's next number; returns the release id. The manifest is
   * stamped with project, design title, label and cut time once the number is taken (under the lock),
   * so two releases of one spec have different manifests and SHA-256s.
   */
  async store(design: Pick<DesignRecord, 'id' | 'revision'>, unstamped: RenderedRelease, actor: Actor): Promise<number> {
    const designId = design.id;
    // Bytes before rows: every file is in the store before the transaction that names it commits (an
    // interrupted cut leaves at most unreferenced files, which a later cut of the same content reuses).
    // The files are written at once, so their syncs overlap, and meanwhile the transaction takes the
    // number; it waits for them (and the stamped manifest) before it commits.
    const files = allSettledOrThrow(unstamped.files.filter((f) => f.name !== MANIFEST_FILE).map((f) => this.putChecked(f)));
    // Awaited in the transaction; a transaction that fails before it gets there reports its own error.
    files.catch(() => undefined);
    return this.dataSource.transaction(async (manager) => {
      await manager.query('SELECT `id` FROM `designs` WHERE `id` = ? FOR UPDATE', [designId]);
      // Read after the lock is granted, so the number sees every cut committed before this one.
      const [row] = (await manager.query(
        'SELECT (SELECT COALESCE(MAX(`number`), 0) + 1 FROM `releases` WHERE `designId` = d.`id`) AS `next`, ' +
          '(SELECT MAX(`number`) FROM `releases` WHERE `designId` = d.`id` AND `specSha256` = ?) AS `sameNumber`, ' +
          'd.`name` AS designTitle, p.`name` AS project FROM `designs` d JOIN `projects` p ON p.`id` = d.`projectId` WHERE d.`id` = ?',
        [unstamped.specSha256, designId],
      )) as { next: number | string; sameNumber: number | string | null; designTitle: string; project: string }[];
      if (!row) throw notFound('design');
      const number = Number(row.next);
      const rendered = stampRelease(unstamped, { project: row.project, designTitle: row.designTitle, label: releaseLabel(number), cutAt: new Date().toISOString() });
      const [, , releaseId] = await allSettledOrThrow<[unknown, void, number]>([files, this.putChecked(rendered.files[0]!), this.insertRows(manager, design, number, rendered, row.sameNumber, actor)]);
      return releaseId;
    });
  }

  /** The rows of a cut: the release, its files, its queued verification and the audit entry. */
  private async insertRows(manager: EntityManager, design: Pick<DesignRecord, 'id' | 'revision'>, number: number, rendered: RenderedRelease, sameNumber: number | string | null, actor: Actor): Promise<number> {
    const designId = design.id;
    const inserted = await manager.insert(Release, {
      designId,
      number,
      state: 'draft',
      specJson: JSON.stringify(rendered.manifest.spec),
      resultsJson: JSON.stringify(rendered.manifest.results),
      specSha256: rendered.specSha256,
      manifestSha256: rendered.manifestSha256,
      designRevision: design.revision,
      createdById: actor.id,
    });
    const releaseId = Number(inserted.identifiers[0]?.id);
    await manager.insert(
      ReleaseFile,
      rendered.files.map((f, position) => ({ releaseId, position, name: f.name, mediaType: f.mediaType, sizeBytes: f.bytes.length, sha256: f.sha256, content: null })),
    );
    await this.verification.queue(manager, releaseId);
    const sameSpecAs = sameNumber === null ? null : releaseLabel(Number(sameNumber));
    await this.audit.record(actor, { action: 'release.cut', objectType: 'release', objectId: releaseId, detail: { designId, number, designRevision: design.revision, manifestSha256: rendered.manifestSha256, sameSpecAs } }, manager);
    return releaseId;
  }

  private async putChecked(f: RenderedRelease['files'][number]): Promise<void> {
    if ((await this.files.put(f.bytes)) !== f.sha256) throw new Error(`file store hashed ${f.name} differently from the render`);
  }

  /** The row, or 404 when it does not exist in the organisation or the user may not see it. */
  async visibleRow(organizationId: number, id: number, user: Pick<SessionUser, 'roles'>, manager: EntityManager = this.dataSource.manager, withContent = false): Promise<ReleaseRow> {
    const row = await findRelease(manager, organizationId, id, withContent);
    if (!row || !canSee(user, row.state)) throw notFound('release');
    return row;
  }

  async getForUser(organizationId: number, id: number, user: Pick<SessionUser, 'roles'>): Promise<ReleaseRecord> {
    const row = await this.visibleRow(organizationId, id, user, this.dataSource.manager, true);
    return this.record(row);
  }

  async verificationForUser(organizationId: number, id: number, user: Pick<SessionUser, 'roles'>): Promise<ReleaseVerificationRecord> {
    const row = await this.visibleRow(organizationId, id, user);
    return this.verification.recordFor(this.dataSource.manager, row.id);
  }

  async record(row: ReleaseRow, manager: EntityManager = this.dataSource.manager): Promise<ReleaseRecord> {
    const [files, reviews, verification, withdrawnReason] = await Promise.all([
      listFiles(manager, row.id),
      listReviews(manager, row.id),
      this.verification.recordFor(manager, row.id),
      row.state === 'withdrawn' ? withdrawalReason(manager, row.id) : Promise.resolve(null),
    ]);
    return {
      ...toSummary(row),
      designName: row.designName,
      projectId: Number(row.projectId),
      spec: JSON.parse(row.specJson ?? 'null') as unknown,
      results: JSON.parse(row.resultsJson ?? 'null') as unknown,
      files: files.map(toFileRecord),
      approvalsRequired: row.approvalsRequired === null ? null : Number(row.approvalsRequired),
      approvals: reviews.filter((r) => r.decision === 'approve').length,
      reviews: reviews.map(toReviewRecord),
      allowedEvents: allowedEvents(row.state),
      caution: CAUTION,
      verification,
      withdrawnReason,
    };
  }

  /**
   * A design as `user` may see it. An account that sees every release state sees the design as it is
   * now; one that sees approved releases only (firmware) sees it as its latest approved release holds
   * it — that release's spec and the revision it was cut from — and a design without one is a 404.
   */
  async designForUser(organizationId: number, designId: number, user: Pick<SessionUser, 'roles'>): Promise<DesignRecord> {
    const design = await this.designs.get(organizationId, designId);
    if (seesAllStates(user)) return design;
    const [latest] = await listReleases(this.dataSource.manager, organizationId, { designId, states: FIRMWARE_VISIBLE_STATES }, true);
    if (!latest) throw notFound('design');
    return asApproved(design, latest);
  }

  /**
   * A project's designs as `user` may see them, each with its release count (firmware: the designs with
   * an approved release, as of the latest, counting approved releases only).
   */
  async designsForUser(organizationId: number, projectId: number, user: Pick<SessionUser, 'roles'>, archived: DesignListQuery['archived'] = 'false'): Promise<DesignListItem[]> {
    const designs = await this.designs.list(organizationId, projectId, archived);
    const releases = await listReleases(this.dataSource.manager, organizationId, { projectId, ...(seesAllStates(user) ? {} : { states: FIRMWARE_VISIBLE_STATES }) });
    const count = new Map<number, number>();
    // Newest first per design (listReleases orders by number descending).
    const latest = new Map<number, ReleaseRow>();
    for (const r of releases) {
      const designId = Number(r.designId);
      count.set(designId, (count.get(designId) ?? 0) + 1);
      if (!latest.has(designId)) latest.set(designId, r);
    }
    if (seesAllStates(user)) return designs.map((d) => ({ ...d, releaseCount: count.get(d.id) ?? 0 }));
    return designs.flatMap((d) => {
      const r = latest.get(d.id);
      return r ? [{ ...d, revision: Number(r.designRevision), updatedAt: new Date(r.createdAt).toISOString(), releaseCount: count.get(d.id) ?? 0 }] : [];
    });
  }

  /** Projects as `user` may see them: for firmware, each counts only the designs with an approved release. */
  async projectsForUser<P extends { id: number; designCount: number }>(organizationId: number, projects: readonly P[], user: Pick<SessionUser, 'roles'>): Promise<P[]> {
    if (seesAllStates(user)) return [...projects];
    const approved = await listReleases(this.dataSource.manager, organizationId, { states: FIRMWARE_VISIBLE_STATES });
    const designs = new Map<number, Set<number>>();
    for (const r of approved) {
      const set = designs.get(Number(r.projectId)) ?? new Set<number>();
      set.add(Number(r.designId));
      designs.set(Number(r.projectId), set);
    }
    return projects.map((p) => ({ ...p, designCount: designs.get(p.id)?.size ?? 0 }));
  }

  async listForDesign(organizationId: number, designId: number, user: Pick<SessionUser, 'roles'>): Promise<ReleaseSummary[]> {
    await this.designForUser(organizationId, designId, user);
    const rows = await listReleases(this.dataSource.manager, organizationId, { designId, ...(seesAllStates(user) ? {} : { states: FIRMWARE_VISIBLE_STATES }) });
    return rows.map(toSummary);
  }

  /** Approved releases of the organisation (the Downloads screen). */
  async listApproved(organizationId: number): Promise<ReleaseSummary[]> {
    return (await listReleases(this.dataSource.manager, organizationId, { states: ['approved'] })).map(toSummary);
  }

  /**
   * Moves a release to the state the state machine gives for `event`, as a compare-and-set on the
   * state it read (under the row lock of `manager`'s transaction when the caller holds one).
   */
  async applyEvent(manager: EntityManager, row: Pick<ReleaseRow, 'id' | 'state'>, event: ReleaseEvent, extra: { approvalsRequired?: number } = {}): Promise<ReleaseRow['state']> {
    const t = transition(row.state, event);
    if (!t.ok) throw conflict(t.message, 'state');
    const result = await manager
      .createQueryBuilder()
      .update(Release)
      .set({ state: t.to, stateChangedAt: () => 'CURRENT_TIMESTAMP(3)', ...extra })
      .where('id = :id AND state = :state', { id: row.id, state: row.state })
      .execute();
    if (result.affected !== 1) throw conflict('the release changed state meanwhile; reload it', 'state');
    return t.to;
  }

  async withdraw(organizationId: number, id: number, actor: Actor, reason: string | undefined): Promise<ReleaseRecord> {
    await releaseStateTransaction(this.dataSource, async (manager) => {
      const row = await findRelease(manager, organizationId, id, false, true);
      if (!row) throw notFound('release');
      const to = await this.applyEvent(manager, row, 'withdraw');
      await this.audit.record(actor, { action: 'release.withdraw', objectType: 'release', objectId: id, detail: { from: row.state, to, reason: reason ?? null } }, manager);
    });
    return this.getForUser(organizationId, id, { roles: ['designer'] });
  }

  /**
   * The files of a release (or the one named) with their bytes, each checked against its SHA-256:
   * from the file store, or from the row for releases cut before the store existed.
   */
  async fileBytes(releaseId: number, name?: string): Promise<(FileRow & { content: Buffer })[]> {
    return releaseFileBytes(this.dataSource.manager, this.files, releaseId, name);
  }

  async manifestOf(releaseId: number): Promise<Manifest> {
    const [file] = await this.fileBytes(releaseId, 'manifest.json');
    if (!file) throw new AppError('internal', 'the release has no manifest', 500);
    return JSON.parse(file.content.toString('utf8')) as Manifest;
  }

  async diff(organizationId: number, id: number, againstId: number, user: Pick<SessionUser, 'roles'>): Promise<ReleaseDiff> {
    const [to, from] = await Promise.all([this.visibleRow(organizationId, id, user, undefined, true), this.visibleRow(organizationId, againstId, user, undefined, true)]);
    if (to.designId !== from.designId) throw invalidInput('against', 'compare releases of the same design');
    const side = async (row: ReleaseRow) => ({
      id: Number(row.id),
      label: releaseLabel(Number(row.number)),
      spec: JSON.parse(row.specJson ?? 'null') as unknown,
      manifest: await this.manifestOf(row.id),
      margins: marginsOf(JSON.parse(row.resultsJson ?? 'null')),
      acquisition: (JSON.parse(row.resultsJson ?? 'null') as { acquisition?: unknown } | null)?.acquisition ?? null,
    });
    return releaseDiff(await side(from), await side(to));
  }

  /** The previous release of the same design (for the reviewer's diff), or null. */
  async previousOf(organizationId: number, row: ReleaseRow): Promise<ReleaseRow | null> {
    const rows = await listReleases(this.dataSource.manager, organizationId, { designId: row.designId });
    return rows.find((r) => Number(r.number) < Number(row.number)) ?? null;
  }

  /** Registered with the design service: a design with releases cannot be deleted. */
  async releaseCount(designId: number, manager: EntityManager): Promise<number> {
    return manager.count(Release, { where: { designId } });
  }
}
