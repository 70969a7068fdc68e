import type { Request, Response } from 'express';
import {
  ACQUISITION_STREAM_TYPE,
  acquisitionRequestSchema,
  analysisRequestSchema,
  idParamsSchema,
  simulationRequestSchema,
  specSimulationRequestSchema,
  type AcquisitionResponse,
  type AcquisitionStreamLine,
  type AnalysisResponse,
  type SimulationResponse,
} from '@loopwright/contract';
import type { EncodedJson } from '../encodedJson.ts';
import { AppError } from '../errors.ts';
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

type AcquisitionWork = (cancel: AbortSignal, onProgress?: (fraction: number) => void) => Promise<AcquisitionResponse>;

/**
 * Plain JSON, or with `Accept: application/x-ndjson` one line per progress report and then the result.
 * The stream opens at the first progress report, so a bad spec (refused before the search starts) is
 * still an ordinary 400; a failure after that is the stream's last line. Closing the connection
 * cancels the search (its worker is stopped).
 */
async function answerAcquisition(req: Request, res: Response, work: AcquisitionWork): Promise<AcquisitionResponse | undefined> {
  const cancel = whenClientGone(res);
  if (!(req.get('accept') ?? '').includes(ACQUISITION_STREAM_TYPE)) return work(cancel);
  const send = (line: AcquisitionStreamLine) => {
    if (!res.headersSent) {
      res.status(200).type(ACQUISITION_STREAM_TYPE);
      // Progress is worth nothing once buffered: tell nginx to pass each line on as it comes.
      res.setHeader('X-Accel-Buffering', 'no');
      res.setHeader('Cache-Control', 'no-store');
      res.flushHeaders();
    }
    res.write(`${JSON.stringify(line)}\n`);
  };
  try {
    const result = await work(cancel, (fraction) => send({ type: 'progress', fraction }));
    send({ type: 'result', ...result });
  } catch (err) {
    if (!res.headersSent) throw err;
    const error = err instanceof AppError ? { code: err.code, message: err.message, ...(err.field === undefined ? {} : { field: err.field }) } : { code: 'internal', message: 'the acquisition search failed' };
    send({ type: 'error', error });
  }
  res.end();
  return undefined;
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
    handler: ({ services, body, res }): Promise<EncodedJson<SimulationResponse>> => services.analysis.simulateSpec(body.spec, body, whenClientGone(res)),
  }),
  route({
    method: 'post',
    path: '/designs/:id/simulations',
    access: ANALYSTS,
    summary: "simulate a stored design's current spec under a scenario",
    params: idParamsSchema,
    body: simulationRequestSchema,
    handler: ({ services, user, params, body, res }): Promise<EncodedJson<SimulationResponse>> =>
      services.analysis.simulateStoredDesign(user.organizationId, params.id, body, whenClientGone(res)),
  }),
  route({
    method: 'post',
    path: '/acquisitions',
    access: ANALYSTS,
    summary: 'lock-in, pull-out, hold-in and pull-in of the spec in the body, estimated and measured by simulation (nothing is stored; NDJSON progress on request)',
    body: acquisitionRequestSchema,
    handler: ({ services, body, req, res }) => answerAcquisition(req, res, (cancel, onProgress) => services.analysis.measureAcquisition(body.spec, cancel, onProgress)),
  }),
  route({
    method: 'post',
    path: '/designs/:id/acquisitions',
    access: ANALYSTS,
    summary: "a stored design's acquisition figures, estimated and measured by simulation (NDJSON progress on request)",
    params: idParamsSchema,
    handler: ({ services, user, params, req, res }) =>
      answerAcquisition(req, res, (cancel, onProgress) => services.analysis.measureStoredAcquisition(user.organizationId, params.id, cancel, onProgress)),
  }),
];
