/**
 * Release fixtures made through the services (no HTTP), for tests of other modules such as the
 * route × role table. A delivered mail's text is not kept, so the reviewer's row is given a token of
 * the fixture's own (issueToken, the same as the service's) instead of reading it from the e-mail.
 */
import type { BuiltApp } from '../../src/app.ts';
import { issueToken } from '../../src/releases/reviewToken.ts';
import type { TestOrg } from '../helpers.ts';

export interface ReleaseFixtures {
  /** An approved release (visible to every role) of `designId`. */
  approvedId: number;
  manifestSha256: string;
  goldenCsv: Buffer;
  freshDraft(): Promise<number>;
  /** A release in review and the token of the link e-mailed to the org's reviewer. */
  freshToken(): Promise<{ releaseId: number; token: string; manifestSha256: string }>;
}

export async function releaseFixtures(built: BuiltApp, org: TestOrg, designId: number): Promise<ReleaseFixtures> {
  const { handoff, dataSource } = built.services;
  const designer = { id: org.ids.designer, email: org.emails.designer, ip: null, displayName: 'Designer' };
  const freshDraft = async () => (await handoff.releases.cut(org.organizationId, designId, designer)).id;
  const freshToken = async () => {
    const releaseId = await freshDraft();
    await handoff.verification.runOnce(releaseId);
    const release = await handoff.reviews.requestReview(org.organizationId, releaseId, { reviewerIds: [org.ids.reviewer], approvalsRequired: 1 }, designer);
    const issued = issueToken({ releaseId, reviewerId: org.ids.reviewer, manifestSha256: release.manifestSha256 });
    await dataSource.query('UPDATE `release_reviews` SET `selector` = ?, `tokenHash` = ? WHERE `releaseId` = ? AND `reviewerId` = ?', [issued.selector, issued.tokenHash, releaseId, org.ids.reviewer]);
    return { releaseId, token: issued.token, manifestSha256: release.manifestSha256 };
  };
  const first = await freshToken();
  await handoff.reviews.decide(first.token, { decision: 'approve', manifestSha256: first.manifestSha256 }, null, undefined);
  const golden = (await handoff.releases.fileBytes(first.releaseId)).find((f) => f.name.endsWith('_vectors.csv'))!;
  return { approvedId: first.releaseId, manifestSha256: first.manifestSha256, goldenCsv: golden.content, freshDraft, freshToken };
}
