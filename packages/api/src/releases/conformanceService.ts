/** Conformance uploads of a release: compare with its golden vectors, store the verdict, list them. */
import { HIDDEN_TEXT_CHARACTERS } from '@loopwright/contract';
import type { GoldenVectors, LoopSpec } from '@loopwright/dsp';
import type { DataSource } from 'typeorm';
import type { SessionUser } from '@loopwright/contract';
import { AppError, invalidInput } from '../errors.ts';
import type { AuditActor, AuditService } from '../services/audit.ts';
import { CONFORMANCE_UPLOAD_FIELD, CONFORMANCE_UPLOAD_LIMIT_BYTES, type ConformanceRecord } from '@loopwright/contract';
import { ConformanceRun } from './entities/index.ts';
import type { Actor, ReleaseService } from './releaseService.ts';
import { artifactNames } from '../render/artifacts.ts';
import type { ComputePool } from '../services/compute.ts';

interface RunRow {
  id: number;
  releaseId: number;
  uploadedById: number;
  uploadedByName: string;
  fileName: string;
  sizeBytes: number;
  sha256: string;
  verdict: 'bit-exact' | 'mismatch';
  samplesCompared: number;
  mismatchCount: number;
  firstMismatchesJson: string;
  createdAt: Date | string;
}

const HIDDEN_ALL = new RegExp(HIDDEN_TEXT_CHARACTERS.source, 'g');

/** The uploaded file's name as it is stored and shown: characters that hide or reorder text become "_". */
function printableFileName(name: string): string {
  return name.replace(HIDDEN_ALL, '_') || 'capture.csv';
}

function toRecord(r: RunRow): ConformanceRecord {
  return {
    id: Number(r.id),
    releaseId: Number(r.releaseId),
    uploadedById: Number(r.uploadedById),
    uploadedByName: r.uploadedByName,
    fileName: r.fileName,
    sizeBytes: Number(r.sizeBytes),
    sha256: r.sha256,
    verdict: r.verdict,
    samplesCompared: Number(r.samplesCompared),
    mismatchCount: Number(r.mismatchCount),
    firstMismatches: JSON.parse(r.firstMismatchesJson) as ConformanceRecord['firstMismatches'],
    createdAt: new Date(r.createdAt).toISOString(),
  };
}

export class ConformanceService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly releases: ReleaseService,
    private readonly audit: AuditService,
    private readonly compute: ComputePool,
  ) {}

  async upload(organizationId: number, releaseId: number, file: Express.Multer.File | undefined, user: SessionUser, actor: Actor): Promise<ConformanceRecord> {
    if (!file) throw invalidInput(CONFORMANCE_UPLOAD_FIELD, `attach the capture CSV in the multipart field "${CONFORMANCE_UPLOAD_FIELD}"`);
    const row = await this.releases.visibleRow(organizationId, releaseId, user, undefined, true);
    const spec = JSON.parse(row.specJson ?? '{}') as LoopSpec;
    const stored = JSON.parse(row.resultsJson ?? '{}') as { vectors?: { scenario?: GoldenVectors['scenario'] } };
    if (!stored.vectors?.scenario) throw new AppError('internal', 'the release records no golden-vector scenario', 500);
    const [goldenFile] = await this.releases.fileBytes(row.id, artifactNames(spec.name).vectors);
    if (!goldenFile) throw new AppError('internal', 'the release has no golden vectors', 500);
    const fileName = printableFileName(file.originalname);
    // Parsing and comparing megabytes of CSV happens in the compute pool, never on the event loop.
    const outcome = await this.compute.run({ kind: 'conformance', golden: goldenFile.content, capture: file.buffer, scenario: stored.vectors.scenario, ncoAccumulatorBits: spec.nco.accumulatorBits });
    if (!outcome.ok) {
      const reason = outcome.issues.map((i) => i.message).join('; ');
      // A refused capture is part of the release's record too: who tried which file, and why it was refused.
      await this.audit.record(actor, { action: 'release.conformance-rejected', objectType: 'release', objectId: row.id, detail: { fileName: fileName.slice(0, 255), sizeBytes: file.size, reason } });
      throw invalidInput(CONFORMANCE_UPLOAD_FIELD, `${fileName.slice(0, 120)}: ${reason}`);
    }
    if (outcome.kind !== 'conformance') throw new Error('compute pool answered a conformance check with another kind');
    const result = outcome.comparison;
    const id = await this.dataSource.transaction(async (manager) => {
      const inserted = await manager.insert(ConformanceRun, {
        releaseId: row.id,
        uploadedById: user.id,
        fileName: fileName.slice(0, 255),
        sizeBytes: file.size,
        sha256: outcome.sha256,
        verdict: result.verdict,
        samplesCompared: result.samplesCompared,
        mismatchCount: result.mismatchCount,
        firstMismatchesJson: JSON.stringify(result.firstMismatches),
      });
      const runId = Number(inserted.identifiers[0]?.id);
      await this.audit.record(actor, { action: 'release.conformance', objectType: 'release', objectId: row.id, detail: { runId, verdict: result.verdict, mismatchCount: result.mismatchCount } }, manager);
      return runId;
    });
    const [record] = await this.query(row.id, id);
    if (!record) throw new AppError('internal', 'the conformance run was not stored', 500);
    return record;
  }

  /**
   * An upload refused before it reached upload() (the multipart parser: too large, another field) goes
   * into the release's audit trail as the other refusals do, when the sender may see that release.
   */
  async recordRefusedUpload(releaseIdText: string | string[] | undefined, user: SessionUser | undefined, actor: AuditActor, error: unknown): Promise<void> {
    const releaseId = typeof releaseIdText === 'string' ? Number(releaseIdText) : NaN;
    if (!user || !Number.isInteger(releaseId) || releaseId <= 0) return;
    const row = await this.releases.visibleRow(user.organizationId, releaseId, user).catch(() => null);
    if (!row) return;
    const code = (error as { code?: string }).code;
    const reason =
      code === 'LIMIT_FILE_SIZE'
        ? `the file is larger than the ${CONFORMANCE_UPLOAD_LIMIT_BYTES / (1024 * 1024)} MiB a capture may be`
        : `the upload was refused before it was read (${String((error as { message?: string }).message ?? code ?? 'multipart error').slice(0, 200)})`;
    await this.audit.record({ ...actor, id: user.id }, { action: 'release.conformance-rejected', objectType: 'release', objectId: row.id, detail: { fileName: null, sizeBytes: null, reason } });
  }

  async list(organizationId: number, releaseId: number, user: SessionUser): Promise<ConformanceRecord[]> {
    const row = await this.releases.visibleRow(organizationId, releaseId, user);
    return this.query(row.id);
  }

  private async query(releaseId: number, id?: number): Promise<ConformanceRecord[]> {
    const qb = this.dataSource
      .createQueryBuilder()
      .select([
        'c.id AS id',
        'c.releaseId AS releaseId',
        'c.uploadedById AS uploadedById',
        'u.displayName AS uploadedByName',
        'c.fileName AS fileName',
        'c.sizeBytes AS sizeBytes',
        'c.sha256 AS sha256',
        'c.verdict AS verdict',
        'c.samplesCompared AS samplesCompared',
        'c.mismatchCount AS mismatchCount',
        'c.firstMismatchesJson AS firstMismatchesJson',
        'c.createdAt AS createdAt',
      ])
      .from(ConformanceRun, 'c')
      .innerJoin('users', 'u', 'u.id = c.uploadedById')
      .where('c.releaseId = :releaseId', { releaseId })
      .orderBy('c.id', 'DESC');
    if (id !== undefined) qb.andWhere('c.id = :id', { id });
    return (await qb.getRawMany<RunRow>()).map(toRecord);
  }
}
