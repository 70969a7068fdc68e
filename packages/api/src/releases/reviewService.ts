/**
 * Review requests and the e-mailed review links (tokens: reviewToken.ts). A decision is a POST that
 * locks the release row, then the link row, checks the token, its bindings and its holder's authority,
 * marks it used, counts the approvals and moves the release through the state machine, all in one
 * transaction (releaseStateTransaction: READ COMMITTED under the release's row lock, so the count sees
 * every decision committed before it). Refusals (replayed, expired, tampered, foreign, the holder
 * disabled or no longer a reviewer) roll that back and are recorded in the audit trail on their own,
 * under the release's organisation when the link names one.
 */
import type { DataSource, EntityManager } from 'typeorm';
import type { SessionUser } from '@loopwright/contract';
import { Design } from '../entities/Design.ts';
import { User } from '../entities/User.ts';
import { AppError, conflict, invalidInput, notFound } from '../errors.ts';
import type { HandoffConfig } from '../mail/config.ts';
import type { MailMessage, MailOutbox } from '../mail/outbox.ts';
import type { AuditActor, AuditService } from '../services/audit.ts';
import type { ReleaseRecord, ReviewDecisionRequest, ReviewDecisionResponse, ReviewLinkView, ReviewRequest, WaitingReviewList } from '@loopwright/contract';
import { ReleaseReview } from './entities/index.ts';
import { releaseApprovedMail, reviewDecidedMail, reviewRequestMail, type MailedRelease } from './mails.ts';
import { releaseLabel, type ReleaseRow } from './records.ts';
import type { Actor, ReleaseService } from './releaseService.ts';
import { findRelease, releaseStateTransaction } from './repository.ts';
import { issueToken, parseToken, tokenMatches } from './reviewToken.ts';
import type { ReleaseState } from '@loopwright/contract';

export type RefusalReason = 'malformed' | 'unknown' | 'tampered' | 'replayed' | 'expired' | 'foreign' | 'disabled' | 'revoked';

const REFUSAL_TEXT: Record<RefusalReason, string> = {
  malformed: 'this review link is not a valid link (it may have been cut or altered)',
  unknown: 'this review link does not exist (it may have been altered)',
  tampered: 'this review link does not match its record (it was altered or does not belong to this release)',
  replayed: 'this review link was already used; each link decides once',
  expired: 'this review link has expired; ask the designer for a new review request',
  foreign: 'this review link belongs to someone or something else',
  disabled: 'the account this review link was sent to is disabled, so the link no longer decides',
  revoked: 'the account this review link was sent to no longer holds the reviewer role, so the link no longer decides',
};

/** Where a refusal is filed: the release (and its organisation) a link's selector found, if any. */
interface RefusalContext {
  readonly organizationId: number;
  readonly releaseId: number;
  readonly reviewerId: number;
}

export class ReviewLinkRefused extends AppError {
  context: RefusalContext | undefined;

  constructor(
    readonly reason: RefusalReason,
    detail?: string,
  ) {
    super('forbidden', detail ? `${REFUSAL_TEXT[reason]}: ${detail}` : REFUSAL_TEXT[reason], 403, 'token');
  }
}

/** Runs `check`; a refusal it throws is tagged with the release the link belongs to. */
async function within<T>(context: RefusalContext, check: () => Promise<T>): Promise<T> {
  try {
    return await check();
  } catch (err) {
    if (err instanceof ReviewLinkRefused) err.context ??= context;
    throw err;
  }
}

interface LinkRow {
  id: number;
  releaseId: number;
  reviewerId: number;
  reviewerName: string;
  reviewerEmail: string;
  selector: string;
  tokenHash: string;
  manifestSha256: string;
  expiresAt: Date | string;
  usedAt: Date | string | null;
  /** The reviewer's account as it is now: authority is checked when the link is used. */
  reviewerDisabled: number | boolean;
  /** MariaDB SET column, raw: "reviewer,firmware". */
  reviewerRoles: string;
  reviewerOrganizationId: number;
  organizationId: number;
}

interface Decided {
  response: ReviewDecisionResponse;
  mailIds: string[];
}

interface FirmwareRecipient {
  email: string;
  displayName: string;
}

export class ReviewService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly releases: ReleaseService,
    private readonly audit: AuditService,
    private readonly outbox: MailOutbox,
    private readonly config: HandoffConfig,
  ) {}

  reviewUrl(token: string): string {
    return `${this.config.publicUrl}/review/${token}`;
  }

  /** The designer's page of a release: the design's releases with this one opened. */
  releaseUrl(designId: number, id: number): string {
    return `${this.config.publicUrl}/designs/${designId}/releases?release=${id}`;
  }

  /** The firmware engineer's page of an approved release: Downloads with this one opened. */
  downloadsUrl(id: number): string {
    return `${this.config.publicUrl}/downloads?release=${id}`;
  }

  async requestReview(organizationId: number, releaseId: number, request: ReviewRequest, actor: Actor): Promise<ReleaseRecord> {
    if (request.approvalsRequired > request.reviewerIds.length) {
      throw invalidInput('approvalsRequired', `approvalsRequired ${request.approvalsRequired} exceeds the ${request.reviewerIds.length} reviewer(s) named`);
    }
    const mailIds = await releaseStateTransaction(this.dataSource, async (manager) => {
      const row = await findRelease(manager, organizationId, releaseId, true, true);
      if (!row) throw notFound('release');
      const reviewers = await this.reviewers(manager, organizationId, request.reviewerIds, [actor.id, Number(row.createdById)]);
      await this.releases.applyEvent(manager, row, 'request-review', { approvalsRequired: request.approvalsRequired });
      // The name as the account holds it now, not as the requester's session cached it.
      const requester = await manager.findOne(User, { where: { id: actor.id }, select: { displayName: true } });
      const about = mailedRelease(row);
      const expiresAt = new Date(Date.now() + this.config.reviewLinkTtlS * 1000);
      const verification = await this.releases.verification.recordFor(manager, row.id);
      const mailIds: string[] = [];
      for (const reviewer of reviewers) {
        const issued = issueToken({ releaseId: row.id, reviewerId: reviewer.id, manifestSha256: row.manifestSha256 });
        const [mailId] = await this.outbox.enqueue(manager, [
          reviewRequestMail({
            to: reviewer.email,
            reviewerName: reviewer.displayName,
            requesterName: requester?.displayName ?? '',
            ...about,
            link: this.reviewUrl(issued.token),
            expiresAt,
            approvalsRequired: request.approvalsRequired,
            manifestSha256: row.manifestSha256,
            verificationSummary: verification.summary,
          }),
        ]);
        // The review points at its mail, so the release page can say whether the link went out.
        await manager.insert(ReleaseReview, {
          releaseId: row.id,
          reviewerId: reviewer.id,
          requestedById: actor.id,
          selector: issued.selector,
          tokenHash: issued.tokenHash,
          manifestSha256: row.manifestSha256,
          expiresAt,
          mailId: mailId ?? null,
        });
        if (mailId !== undefined) mailIds.push(mailId);
      }
      await this.audit.record(actor, { action: 'release.review-requested', objectType: 'release', objectId: row.id, detail: { reviewerIds: request.reviewerIds, approvalsRequired: request.approvalsRequired, expiresAt: expiresAt.toISOString() } }, manager);
      return mailIds;
    });
    await this.outbox.deliverPending(mailIds);
    return this.releases.getForUser(organizationId, releaseId, { roles: ['designer'] });
  }

  /** Releases in review where the reviewer's link is neither used nor expired, oldest request first. */
  async waitingFor(organizationId: number, reviewerId: number): Promise<WaitingReviewList> {
    const rows = (await this.dataSource.query(
      'SELECT r.`id` AS releaseId, r.`designId` AS designId, p.`name` AS projectName, d.`name` AS designName, r.`number` AS number, u.`displayName` AS requestedByName, v.`createdAt` AS requestedAt, v.`expiresAt` AS expiresAt ' +
        'FROM `release_reviews` v JOIN `releases` r ON r.`id` = v.`releaseId` JOIN `designs` d ON d.`id` = r.`designId` JOIN `projects` p ON p.`id` = d.`projectId` JOIN `users` u ON u.`id` = v.`requestedById` ' +
        "WHERE v.`reviewerId` = ? AND p.`organizationId` = ? AND r.`state` = 'in-review' AND v.`usedAt` IS NULL AND v.`expiresAt` > CURRENT_TIMESTAMP(3) ORDER BY v.`createdAt`, v.`id`",
      [reviewerId, organizationId],
    )) as { releaseId: number; designId: number; projectName: string; designName: string; number: number; requestedByName: string; requestedAt: Date; expiresAt: Date }[];
    return {
      reviews: rows.map((r) => ({
        releaseId: Number(r.releaseId),
        designId: Number(r.designId),
        projectName: r.projectName,
        designName: r.designName,
        label: releaseLabel(Number(r.number)),
        requestedByName: r.requestedByName,
        requestedAt: new Date(r.requestedAt).toISOString(),
        expiresAt: new Date(r.expiresAt).toISOString(),
      })),
    };
  }

  private async reviewers(manager: EntityManager, organizationId: number, ids: readonly number[], excluded: readonly number[]): Promise<User[]> {
    const users = await manager.getRepository(User).findBy(ids.map((id) => ({ id, organizationId })));
    const byId = new Map(users.map((u) => [u.id, u]));
    return ids.map((id, i) => {
      const u = byId.get(id);
      const field = `reviewerIds.${i}`;
      if (!u) throw invalidInput(field, `no account ${id} in your organisation`);
      if (u.disabled) throw invalidInput(field, `${u.displayName} has a disabled account`);
      if (!u.roles.includes('reviewer')) throw invalidInput(field, `${u.displayName} does not hold the reviewer role`);
      if (excluded.includes(u.id)) throw invalidInput(field, `${u.displayName} cut or requested this release and cannot also review it`);
      return u;
    });
  }

  /**
   * The link row with its reviewer's account and the release's organisation. With `lock`, the row is
   * read FOR UPDATE; callers lock the release row first (the one lock order of every review
   * transaction, so two of them never wait on each other in a cycle).
   */
  private async linkRow(manager: EntityManager, selector: string, lock: boolean): Promise<LinkRow | undefined> {
    if (lock) await manager.query('SELECT `id` FROM `release_reviews` WHERE `selector` = ? FOR UPDATE', [selector]);
    return manager
      .createQueryBuilder()
      .select([
        'v.id AS id',
        'v.releaseId AS releaseId',
        'v.reviewerId AS reviewerId',
        'u.displayName AS reviewerName',
        'u.email AS reviewerEmail',
        'u.disabled AS reviewerDisabled',
        'u.roles AS reviewerRoles',
        'u.organizationId AS reviewerOrganizationId',
        'p.organizationId AS organizationId',
        'v.selector AS selector',
        'v.tokenHash AS tokenHash',
        'v.manifestSha256 AS manifestSha256',
        'v.expiresAt AS expiresAt',
        'v.usedAt AS usedAt',
      ])
      .from(ReleaseReview, 'v')
      .innerJoin('v.reviewer', 'u')
      .innerJoin('v.release', 'r')
      .innerJoin(Design, 'd', 'd.id = r.designId')
      .innerJoin('d.project', 'p')
      .where('v.selector = :selector', { selector })
      .getRawOne<LinkRow>();
  }

  /**
   * Checks a token against its row, the release and the holder's authority; returns both or throws
   * ReviewLinkRefused. With `lock` (a decision) the release row and then the link row are locked and
   * read again, so what is checked is what the decision is made on.
   */
  private async verify(manager: EntityManager, token: string, lock: boolean): Promise<{ link: LinkRow; release: ReleaseRow; organizationId: number }> {
    const parsed = parseToken(token);
    if (!parsed) throw new ReviewLinkRefused('malformed');
    const found = await this.linkRow(manager, parsed.selector, false);
    if (!found) throw new ReviewLinkRefused('unknown');
    const organizationId = Number(found.organizationId);
    const context = { organizationId, releaseId: Number(found.releaseId), reviewerId: Number(found.reviewerId) };
    return within(context, async () => {
      const binding = { selector: found.selector, releaseId: context.releaseId, reviewerId: context.reviewerId, manifestSha256: found.manifestSha256 };
      if (!tokenMatches(parsed.secret, binding, found.tokenHash)) throw new ReviewLinkRefused('tampered');
      const release = await findRelease(manager, organizationId, context.releaseId, true, lock);
      const link = lock ? await this.linkRow(manager, parsed.selector, true) : found;
      if (!release || !link) throw new ReviewLinkRefused('unknown');
      if (release.manifestSha256 !== link.manifestSha256) throw new ReviewLinkRefused('tampered', 'the release content is not the one the link was issued for');
      if (link.usedAt !== null) throw new ReviewLinkRefused('replayed');
      if (new Date(link.expiresAt).getTime() <= Date.now()) throw new ReviewLinkRefused('expired');
      assertReviewerAuthority(link, organizationId);
      return { link, release, organizationId };
    });
  }

  /**
   * Records a refusal outside the failed transaction, then rethrows it. A link whose selector found a
   * release is filed under that release and its organisation (its admins read it); a malformed or
   * unknown one belongs to no organisation (the review-link rate limit bounds how many there can be).
   */
  private async refused(err: unknown, token: string, ip: string | null, action: string): Promise<never> {
    if (err instanceof ReviewLinkRefused) {
      const selector = parseToken(token)?.selector ?? null;
      const c = err.context;
      const actor: AuditActor = { id: null, email: null, ip, organizationId: c?.organizationId ?? null };
      const detail = { reason: err.reason, attempted: action, ...(c ? { selector, reviewerId: c.reviewerId } : {}) };
      await this.audit.record(actor, c ? { action: 'review-link.refused', objectType: 'release', objectId: c.releaseId, detail } : { action: 'review-link.refused', objectType: 'review-link', objectId: selector, detail });
    }
    throw err;
  }

  /** What the e-mail link opens. Reads only: the link stays unused. */
  async read(token: string, ip: string | null, sessionUser: SessionUser | undefined): Promise<ReviewLinkView> {
    try {
      const { link, release, organizationId } = await this.verify(this.dataSource.manager, token, false);
      if (sessionUser && sessionUser.id !== Number(link.reviewerId)) throw foreignTo(link, organizationId, 'it was sent to another reviewer');
      const previous = await this.releases.previousOf(organizationId, release);
      const reviewerView = { roles: ['reviewer' as const] };
      return {
        reviewerName: link.reviewerName,
        expiresAt: new Date(link.expiresAt).toISOString(),
        release: await this.releases.record(release),
        diff: previous ? await this.releases.diff(organizationId, release.id, previous.id, reviewerView) : null,
        previous: previous ? await this.previousSide(organizationId, previous) : null,
      };
    } catch (err) {
      return this.refused(err, token, ip, 'read');
    }
  }

  /**
   * Who may read a file of the release through this link, for the download log: the link's reviewer.
   * Reading does not use the link up; a refused link is recorded like any other refusal.
   */
  async fileReader(token: string, ip: string | null, sessionUser: SessionUser | undefined): Promise<{ releaseId: number; reviewer: { id: number; email: string; organizationId: number } }> {
    try {
      const { link, release, organizationId } = await this.verify(this.dataSource.manager, token, false);
      if (sessionUser && sessionUser.id !== Number(link.reviewerId)) throw foreignTo(link, organizationId, 'it was sent to another reviewer');
      return { releaseId: Number(release.id), reviewer: { id: Number(link.reviewerId), email: link.reviewerEmail, organizationId } };
    } catch (err) {
      return this.refused(err, token, ip, 'read-file');
    }
  }

  /** The previous release's label and stored spec (the review page overlays its plots). */
  private async previousSide(organizationId: number, previous: ReleaseRow): Promise<{ id: number; label: string; spec: unknown }> {
    const row = await findRelease(this.dataSource.manager, organizationId, Number(previous.id), true);
    return { id: Number(previous.id), label: releaseLabel(Number(previous.number)), spec: JSON.parse(row?.specJson ?? 'null') as unknown };
  }

  async decide(token: string, body: ReviewDecisionRequest, ip: string | null, sessionUser: SessionUser | undefined): Promise<ReviewDecisionResponse> {
    let outcome: Decided;
    try {
      outcome = await releaseStateTransaction(this.dataSource, async (manager) => {
        const { link, release, organizationId } = await this.verify(manager, token, true);
        if (body.manifestSha256 !== link.manifestSha256) throw foreignTo(link, organizationId, 'the decision is about other release content than this link is for');
        if (sessionUser && sessionUser.id !== Number(link.reviewerId)) throw foreignTo(link, organizationId, 'it was sent to another reviewer');
        return this.record(manager, link, release, organizationId, body, ip, 'link');
      });
    } catch (err) {
      return this.refused(err, token, ip, 'decide');
    }
    await this.outbox.deliverPending(outcome.mailIds);
    return outcome.response;
  }

  /**
   * The same decision in the app, by a signed-in reviewer named on the release: their review row is
   * found by release and person instead of by token, and its link is used up with it.
   */
  async decideSignedIn(organizationId: number, releaseId: number, body: ReviewDecisionRequest, reviewer: SessionUser, ip: string | null): Promise<ReviewDecisionResponse> {
    const outcome = await releaseStateTransaction(this.dataSource, async (manager) => {
      const release = await findRelease(manager, organizationId, releaseId, true, true);
      if (!release) throw notFound('release');
      const rows = (await manager.query('SELECT `selector` FROM `release_reviews` WHERE `releaseId` = ? AND `reviewerId` = ?', [release.id, reviewer.id])) as { selector: string }[];
      const link = rows[0] ? await this.linkRow(manager, rows[0].selector, true) : undefined;
      if (!link) throw new AppError('forbidden', 'you are not a named reviewer of this release', 403);
      if (link.usedAt !== null) throw conflict('you have already decided on this release', 'decision');
      if (new Date(link.expiresAt).getTime() <= Date.now()) throw new AppError('forbidden', 'your review request has expired; ask the designer for a new one', 403);
      // The session's roles were checked by the route; the account as it is now decides (same rule as the link).
      const authority = reviewerAuthorityIssue(link, organizationId);
      if (authority) throw new AppError('forbidden', REFUSAL_TEXT[authority], 403);
      if (body.manifestSha256 !== release.manifestSha256) throw invalidInput('manifestSha256', 'the decision is about other content than this release (reload it)');
      return this.record(manager, link, release, organizationId, body, ip, 'app');
    });
    await this.outbox.deliverPending(outcome.mailIds);
    return outcome.response;
  }

  /** Marks the review decided and moves the release on; the caller has locked and verified both rows. */
  private async record(manager: EntityManager, link: LinkRow, release: ReleaseRow, organizationId: number, body: ReviewDecisionRequest, ip: string | null, via: 'link' | 'app'): Promise<Decided> {
    if (release.state !== 'in-review') throw conflict(`the release is ${release.state}; it no longer takes review decisions`, 'state');
    if (body.decision === 'approve') {
      // A reference RTL that failed (or has not finished) its verification cannot be approved.
      const verification = await this.releases.verification.recordFor(manager, release.id);
      if (!verification.approvable) throw conflict(verification.blockedReason ?? 'the reference RTL is not verified', 'verification');
    }
    await manager.update(ReleaseReview, { id: link.id }, { usedAt: new Date(), decision: body.decision, comment: body.comment ?? null });
    const [{ approvals }] = (await manager.query("SELECT COUNT(*) AS approvals FROM `release_reviews` WHERE `releaseId` = ? AND `decision` = 'approve'", [release.id])) as [{ approvals: number | string }];
    const required = Number(release.approvalsRequired ?? 1);
    let state: ReleaseState = release.state;
    let mails: MailMessage[] = [];
    if (body.decision === 'request-changes') state = await this.releases.applyEvent(manager, release, 'request-changes');
    else if (Number(approvals) >= required) {
      state = await this.releases.applyEvent(manager, release, 'approve');
      mails = await this.approvedMails(manager, organizationId, release);
    }
    mails.push(...(await this.decidedMails(manager, link, release, body, standing(state, Number(approvals), required))));
    const actor: AuditActor = { id: Number(link.reviewerId), email: link.reviewerEmail, ip };
    await this.audit.record(actor, { action: `review.${body.decision}`, objectType: 'release', objectId: release.id, detail: { reviewId: link.id, state, approvals: Number(approvals), required, via } }, manager);
    const mailIds = await this.outbox.enqueue(manager, mails);
    return { response: { decision: body.decision, state, approvals: Number(approvals), approvalsRequired: required }, mailIds };
  }

  private async approvedMails(manager: EntityManager, organizationId: number, release: ReleaseRow): Promise<MailMessage[]> {
    const recipients = (await manager.query(
      "SELECT `email`, `displayName` FROM `users` WHERE `organizationId` = ? AND `disabled` = 0 AND FIND_IN_SET('firmware', `roles`) > 0 ORDER BY `id`",
      [organizationId],
    )) as FirmwareRecipient[];
    const about = mailedRelease(release);
    return recipients.map((r) =>
      releaseApprovedMail({
        to: r.email,
        name: r.displayName,
        ...about,
        downloadsUrl: this.downloadsUrl(release.id),
        manifestSha256: release.manifestSha256,
      }),
    );
  }

  /** To whoever asked for this review and whoever cut the release (enabled accounts, once each). */
  private async decidedMails(manager: EntityManager, link: LinkRow, release: ReleaseRow, body: ReviewDecisionRequest, standingText: string): Promise<MailMessage[]> {
    const recipients = (await manager.query(
      'SELECT DISTINCT u.`email`, u.`displayName` FROM `users` u WHERE u.`disabled` = 0 AND u.`id` <> ? AND (u.`id` = ? OR u.`id` IN (SELECT `requestedById` FROM `release_reviews` WHERE `id` = ?)) ORDER BY u.`id`',
      [Number(link.reviewerId), Number(release.createdById), Number(link.id)],
    )) as FirmwareRecipient[];
    const about = mailedRelease(release);
    return recipients.map((r) =>
      reviewDecidedMail({
        to: r.email,
        name: r.displayName,
        ...about,
        reviewerName: link.reviewerName,
        decision: body.decision,
        comment: body.comment ?? null,
        standing: standingText,
        releaseUrl: this.releaseUrl(Number(release.designId), Number(release.id)),
      }),
    );
  }
}

/** 'disabled' or 'revoked' when the link's holder may no longer decide, else null. */
function reviewerAuthorityIssue(link: LinkRow, organizationId: number): 'disabled' | 'revoked' | null {
  if (Boolean(Number(link.reviewerDisabled))) return 'disabled';
  if (Number(link.reviewerOrganizationId) !== organizationId || !String(link.reviewerRoles).split(',').includes('reviewer')) return 'revoked';
  return null;
}

function assertReviewerAuthority(link: LinkRow, organizationId: number): void {
  const issue = reviewerAuthorityIssue(link, organizationId);
  if (issue) throw new ReviewLinkRefused(issue);
}

function foreignTo(link: LinkRow, organizationId: number, detail: string): ReviewLinkRefused {
  const err = new ReviewLinkRefused('foreign', detail);
  err.context = { organizationId, releaseId: Number(link.releaseId), reviewerId: Number(link.reviewerId) };
  return err;
}

/** Project, design and release of a row with its spec, as the mails name them. */
function mailedRelease(row: ReleaseRow): MailedRelease {
  const specName = (JSON.parse(row.specJson ?? '{}') as { name?: string }).name ?? '';
  return { projectName: row.projectName, designName: row.designName, specName, label: releaseLabel(Number(row.number)) };
}

/** Where a release stands after a decision, in the words of the designer's mail. */
function standing(state: ReleaseState, approvals: number, required: number): string {
  if (state === 'approved') return 'approved';
  if (state === 'changes-requested') return 'marked changes requested';
  return `in review, ${approvals} of ${required} approval(s)`;
}
