/** Routes of releases, reviews, review links, downloads and conformance (paths relative to /api). */
import type { RequestHandler } from 'express';
import { z } from 'zod';
import { idParamsSchema } from '@loopwright/contract';
import { route } from '../routes/table.ts';
import {
  CONFORMANCE_UPLOAD_FIELD,
  CONFORMANCE_UPLOAD_LIMIT_BYTES,
  diffQuerySchema,
  releaseFileParamsSchema,
  releaseParamsSchema,
  reviewDecisionSchema,
  reviewRequestSchema,
  reviewTokenParamsSchema,
  reviewFileParamsSchema,
  estimateRequestSchema,
  type ConformanceListResponse,
  type EstimateResponse,
  type DownloadListResponse,
  type ReleaseListResponse,
  type WaitingReviewList,
} from '@loopwright/contract';

const DESIGNER = ['designer'] as const;
const UPLOADERS = ['firmware', 'designer'] as const;
const withdrawSchema = z.strictObject({ reason: z.string().max(2000).optional() });

/** `reviewLinkLimiter` guards the public review-link routes (refused anonymous requests per address). */
export const releaseRoutes = (reviewLinkLimiter: RequestHandler) => [
  route({
    method: 'post',
    path: '/designs/:id/releases',
    access: DESIGNER,
    summary: 'cut the next release (v1, v2, …) of a design: recompute, render, store with SHA-256',
    status: 201,
    params: idParamsSchema,
    handler: ({ services, user, params, actor }) => services.handoff.releases.cut(user.organizationId, params.id, { ...actor, id: user.id }),
  }),
  route({
    method: 'get',
    path: '/designs/:id/releases',
    access: 'signed-in',
    summary: "list a design's releases (firmware sees approved ones only)",
    params: idParamsSchema,
    handler: async ({ services, user, params }): Promise<ReleaseListResponse> => ({ releases: await services.handoff.releases.listForDesign(user.organizationId, params.id, user) }),
  }),
  route({
    method: 'get',
    path: '/releases',
    access: 'signed-in',
    summary: 'approved releases of the organisation (the Downloads screen)',
    handler: async ({ services, user }): Promise<ReleaseListResponse> => ({ releases: await services.handoff.releases.listApproved(user.organizationId) }),
  }),
  route({
    method: 'get',
    path: '/releases/:id',
    access: 'signed-in',
    summary: 'a release: spec, results, files with SHA-256, reviews, allowed next steps, caution',
    params: releaseParamsSchema,
    handler: ({ services, user, params }) => services.handoff.releases.getForUser(user.organizationId, params.id, user),
  }),
  route({
    method: 'post',
    path: '/estimates',
    access: ['designer', 'reviewer'],
    summary: 'yosys resource estimates of candidate specs (the word-length search cost column): cached, or queued for a background worker',
    body: estimateRequestSchema,
    handler: async ({ services, body }): Promise<EstimateResponse> => {
      const estimates = await services.handoff.estimates.candidates(body.specs);
      if (estimates.some((e) => e.state === 'pending')) services.handoff.verification.wake();
      return { estimates };
    },
  }),
  route({
    method: 'get',
    path: '/releases/:id/verification',
    access: 'signed-in',
    summary: "the server's verification of the release's reference RTL (GHDL, Icarus, yosys estimate) and its progress",
    params: releaseParamsSchema,
    handler: ({ services, user, params }) => services.handoff.releases.verificationForUser(user.organizationId, params.id, user),
  }),
  route({
    method: 'post',
    path: '/releases/:id/withdraw',
    access: DESIGNER,
    summary: 'withdraw a release (its content stays; the state says it must not be used)',
    params: releaseParamsSchema,
    body: withdrawSchema,
    handler: ({ services, user, params, body, actor }) => services.handoff.releases.withdraw(user.organizationId, params.id, { ...actor, id: user.id }, body.reason),
  }),
  route({
    method: 'get',
    path: '/releases/:id/diff',
    access: 'signed-in',
    summary: 'difference to another release of the same design: every changed constant (formats, widths, codes, tables), spec fields, margins',
    params: releaseParamsSchema,
    query: diffQuerySchema,
    handler: ({ services, user, params, query }) => services.handoff.releases.diff(user.organizationId, params.id, query.against, user),
  }),
  route({
    method: 'get',
    path: '/releases/:id/files/:name',
    access: 'signed-in',
    summary: 'download one artifact (logged)',
    params: releaseFileParamsSchema,
    handler: ({ services, user, params, actor, res }) => services.handoff.downloads.sendFile(user.organizationId, params.id, params.name, user, { ...actor, id: user.id }, res),
  }),
  route({
    method: 'get',
    path: '/releases/:id/bundle',
    access: 'signed-in',
    summary: 'download every artifact as a zip, manifest.json first (logged)',
    params: releaseParamsSchema,
    handler: ({ services, user, params, actor, res }) => services.handoff.downloads.sendBundle(user.organizationId, params.id, user, { ...actor, id: user.id }, res),
  }),
  route({
    method: 'get',
    path: '/releases/:id/downloads',
    access: ['designer', 'admin'],
    summary: 'the download log of a release',
    params: releaseParamsSchema,
    handler: async ({ services, user, params }): Promise<DownloadListResponse> => ({ downloads: await services.handoff.downloads.list(user.organizationId, params.id, user) }),
  }),
  route({
    method: 'post',
    path: '/releases/:id/reviews',
    access: DESIGNER,
    summary: 'ask named reviewers for review (each gets an e-mailed single-use link) and set the approvals required',
    params: releaseParamsSchema,
    body: reviewRequestSchema,
    handler: ({ services, user, params, body, actor }) =>
      services.handoff.reviews.requestReview(user.organizationId, params.id, body, { ...actor, id: user.id }),
  }),
  route({
    method: 'get',
    path: '/releases/:id/reviews',
    access: 'signed-in',
    summary: 'reviewers and decisions of a release',
    params: releaseParamsSchema,
    handler: async ({ services, user, params }) => {
      const r = await services.handoff.releases.getForUser(user.organizationId, params.id, user);
      return { approvalsRequired: r.approvalsRequired, approvals: r.approvals, reviews: r.reviews };
    },
  }),
  route({
    method: 'get',
    path: '/reviews/waiting',
    access: ['reviewer'],
    summary: 'the reviews that wait for you: releases in review whose link to you is unused and unexpired',
    handler: ({ services, user }): Promise<WaitingReviewList> => services.handoff.reviews.waitingFor(user.organizationId, user.id),
  }),
  route({
    method: 'post',
    path: '/releases/:id/reviews/decision',
    access: ['reviewer'],
    summary: 'decide in the app as a named reviewer: {decision, comment?, manifestSha256} (uses up your e-mailed link)',
    params: releaseParamsSchema,
    body: reviewDecisionSchema,
    handler: ({ services, user, params, body, req }) => services.handoff.reviews.decideSignedIn(user.organizationId, params.id, body, user, req.ip ?? null),
  }),
  route({
    method: 'get',
    path: '/review-links/:token',
    access: 'public',
    csrf: 'token',
    before: [reviewLinkLimiter],
    summary: 'what an e-mailed review link opens (reads only; the link stays unused)',
    params: reviewTokenParamsSchema,
    handler: ({ services, params, req }) => services.handoff.reviews.read(params.token, req.ip ?? null, req.user),
  }),
  route({
    method: 'get',
    path: '/review-links/:token/files/:name',
    access: 'public',
    csrf: 'token',
    before: [reviewLinkLimiter],
    summary: "read one file of the release a review link is for (logged as the reviewer's download; the link stays unused)",
    params: reviewFileParamsSchema,
    handler: async ({ services, params, req, res }) => {
      const { releaseId, reviewer } = await services.handoff.reviews.fileReader(params.token, req.ip ?? null, req.user);
      await services.handoff.downloads.sendReviewFile(releaseId, params.name, reviewer, req.ip ?? null, res);
    },
  }),
  route({
    method: 'post',
    path: '/review-links/:token',
    access: 'public',
    csrf: 'token',
    before: [reviewLinkLimiter],
    summary: 'decide with an e-mailed review link: {decision: "approve"|"request-changes", comment?, manifestSha256}',
    params: reviewTokenParamsSchema,
    body: reviewDecisionSchema,
    handler: ({ services, params, body, req }) => services.handoff.reviews.decide(params.token, body, req.ip ?? null, req.user),
  }),
  route({
    method: 'post',
    path: '/releases/:id/conformance',
    access: UPLOADERS,
    summary: `upload a capture CSV in the golden-vector layout (multipart field "${CONFORMANCE_UPLOAD_FIELD}"); stores and returns the verdict`,
    status: 201,
    params: releaseParamsSchema,
    upload: {
      field: CONFORMANCE_UPLOAD_FIELD,
      limitBytes: CONFORMANCE_UPLOAD_LIMIT_BYTES,
      onRefused: ({ services, user, actor, params, error }) => services.handoff.conformance.recordRefusedUpload(params['id'], user, actor, error),
    },
    body: z.strictObject({}),
    handler: ({ services, user, params, file, actor }) => services.handoff.conformance.upload(user.organizationId, params.id, file, user, { ...actor, id: user.id }),
  }),
  route({
    method: 'get',
    path: '/releases/:id/conformance',
    access: 'signed-in',
    summary: 'conformance uploads of a release and their verdicts',
    params: releaseParamsSchema,
    handler: async ({ services, user, params }): Promise<ConformanceListResponse> => ({ runs: await services.handoff.conformance.list(user.organizationId, params.id, user) }),
  }),
];
