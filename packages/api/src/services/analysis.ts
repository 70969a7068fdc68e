import type { AnalysisResult, LoopSpec, SimResult } from '@loopwright/dsp';
import { MessageChannel } from 'node:worker_threads';
import type { AcquisitionResponse, AnalysisResponse, SimulationRequest, SimulationResponse } from '@loopwright/contract';
import { encodedJsonOf, encodedObject, type EncodedJson } from '../encodedJson.ts';
import { invalidInput, issuesError } from '../errors.ts';
import type { ComputePool } from './compute.ts';
import type { DesignService } from './designs.ts';

/** The server's own analyses and simulations (the numbers that count), computed off the event loop. */
export class AnalysisService {
  constructor(
    private readonly compute: ComputePool,
    private readonly designs: DesignService,
    private readonly maxSimulationSamples: number,
  ) {}

  async analyzeSpec(spec: LoopSpec, cancel?: AbortSignal): Promise<AnalysisResult> {
    const outcome = await this.compute.run({ kind: 'analysis', spec }, cancel);
    if (!outcome.ok) throw issuesError(outcome.issues, outcome.prefix);
    if (outcome.kind !== 'analysis') throw new Error('compute pool answered an analysis with another kind');
    return outcome.analysis;
  }

  async analyzeStoredDesign(organizationId: number, designId: number, cancel?: AbortSignal): Promise<AnalysisResponse> {
    const design = await this.designs.get(organizationId, designId);
    return { analysis: await this.analyzeSpec(design.spec, cancel), designId: design.id, revision: design.revision };
  }

  /**
   * The acquisition figures, estimated and measured (dsp measureAcquisition, under a second per demo
   * spec), in the compute pool like a simulation; `onProgress` hears the fraction done from the worker.
   */
  async measureAcquisition(spec: LoopSpec, cancel?: AbortSignal, onProgress?: (fraction: number) => void): Promise<AcquisitionResponse> {
    const channel = onProgress ? new MessageChannel() : null;
    // The port and the pool's answer are separate channels: the last report may lag the answer, so
    // completion is reported here and anything after it is dropped.
    let last = 0;
    channel?.port1.on('message', (fraction: number) => {
      if (fraction > last) onProgress?.((last = fraction));
    });
    try {
      const task = { kind: 'acquisition' as const, spec, ...(channel ? { progress: channel.port2 } : {}) };
      const outcome = await this.compute.run(task, cancel, channel ? [channel.port2] : undefined);
      if (!outcome.ok) throw issuesError(outcome.issues, outcome.prefix);
      if (outcome.kind !== 'acquisition') throw new Error('compute pool answered an acquisition with another kind');
      if (last < 1) onProgress?.((last = 1));
      return { acquisition: outcome.acquisition };
    } finally {
      channel?.port1.close();
    }
  }

  async measureStoredAcquisition(organizationId: number, designId: number, cancel?: AbortSignal, onProgress?: (fraction: number) => void): Promise<AcquisitionResponse> {
    const design = await this.designs.get(organizationId, designId);
    return { ...(await this.measureAcquisition(design.spec, cancel, onProgress)), designId: design.id, revision: design.revision };
  }

  /**
   * One request may simulate at most maxSimulationSamples loop samples (durationS × sampleRateHz). The
   * answer comes encoded (encodedJson.ts): the compute thread wrote the simulation's JSON.
   */
  async simulateSpec(spec: LoopSpec, request: SimulationRequest, cancel?: AbortSignal): Promise<EncodedJson<SimulationResponse>> {
    return encodedObject({ scenario: request.scenario, simulation: await this.simulation(spec, request, cancel) });
  }

  async simulateStoredDesign(organizationId: number, designId: number, request: SimulationRequest, cancel?: AbortSignal): Promise<EncodedJson<SimulationResponse>> {
    const design = await this.designs.get(organizationId, designId);
    const simulation = await this.simulation(design.spec, request, cancel);
    return encodedObject({ scenario: request.scenario, simulation, designId: design.id, revision: design.revision });
  }

  private async simulation(spec: LoopSpec, request: SimulationRequest, cancel?: AbortSignal): Promise<EncodedJson<SimResult>> {
    const samples = Math.ceil(request.scenario.durationS * spec.sampleRateHz);
    if (samples > this.maxSimulationSamples) {
      const maxDurationS = this.maxSimulationSamples / spec.sampleRateHz;
      throw invalidInput('scenario.durationS', `scenario.durationS ${request.scenario.durationS} s is ${samples} loop samples at ${spec.sampleRateHz} Hz; this server simulates at most ${this.maxSimulationSamples} per request (durationS ≤ ${Number(maxDurationS.toPrecision(4))} s)`);
    }
    const options = { mode: request.mode, buckets: request.buckets };
    const outcome = await this.compute.runSimulation({ kind: 'simulation', spec, scenario: request.scenario, options }, cancel);
    if (!outcome.ok) throw issuesError(outcome.issues, outcome.prefix);
    if (outcome.kind !== 'simulation') throw new Error('compute pool answered a simulation with another kind');
    return encodedJsonOf(outcome.simulationJson);
  }
}
