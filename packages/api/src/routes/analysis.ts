import { analysisRequestSchema, idParamsSchema, type AnalysisResponse } from '../contract.ts';
import { route } from './table.ts';

const ANALYSTS = ['designer', 'reviewer'] as const;

export const analysisRoutes = [
  route({
    method: 'post',
    path: '/analysis',
    access: ANALYSTS,
    summary: 'analyse the spec in the body (nothing is stored)',
    body: analysisRequestSchema,
    handler: async ({ services, body }): Promise<AnalysisResponse> => ({ analysis: await services.analysis.analyzeSpec(body.spec) }),
  }),
  route({
    method: 'post',
    path: '/designs/:id/analysis',
    access: ANALYSTS,
    summary: "analyse a stored design's current spec",
    params: idParamsSchema,
    handler: ({ services, user, params }): Promise<AnalysisResponse> => services.analysis.analyzeStoredDesign(user.organizationId, params.id),
  }),
];
