import type { Response } from 'express';
import {
  analysisRequestSchema,
  idParamsSchema,
  simulationRequestSchema,
  specSimulationRequestSchema,
  type AnalysisResponse,
  type SimulationResponse,
} from '@loopwright/contract';
import { route } from './table.ts';

const ANALYSTS = ['designer', 'reviewer'] as const;

/** Aborts the computation when the client goes away before the answer is sent. */
function whenClientGone(res: Response): AbortSignal {
  const controller = new AbortController();
  res.on('close', () => {
    if (!res.writableFinished) controller.abort();
  });
  return controller.signal;
}

export const analysisRoutes = [
  route({
    method: 'post',
    path: '/analysis',
    access: ANALYSTS,
    summary: 'analyse the spec in the body (nothing is stored)',
    body: analysisRequestSchema,
    handler: async ({ services, body, res }): Promise<AnalysisResponse> => ({ analysis: await services.analysis.analyzeSpec(body.spec, whenClientGone(res)) }),
  }),
  route({
    method: 'post',
    path: '/designs/:id/analysis',
    access: ANALYSTS,
    summary: "analyse a stored design's current spec",
    params: idParamsSchema,
    handler: ({ services, user, params, res }): Promise<AnalysisResponse> => services.analysis.analyzeStoredDesign(user.organizationId, params.id, whenClientGone(res)),
  }),
  route({
    method: 'post',
    path: '/simulations',
    access: ANALYSTS,
    summary: 'simulate the spec in the body under a scenario, float and bit-true (nothing is stored)',
    body: specSimulationRequestSchema,
    handler: ({ services, body, res }): Promise<SimulationResponse> => services.analysis.simulateSpec(body.spec, body, whenClientGone(res)),
  }),
  route({
    method: 'post',
    path: '/designs/:id/simulations',
    access: ANALYSTS,
    summary: "simulate a stored design's current spec under a scenario",
    params: idParamsSchema,
    body: simulationRequestSchema,
    handler: ({ services, user, params, body, res }): Promise<SimulationResponse> =>
      services.analysis.simulateStoredDesign(user.organizationId, params.id, body, whenClientGone(res)),
  }),
];
