import type { AnalysisResult, LoopSpec, SpecIssue } from '@loopwright/dsp';
import type { AnalysisResponse } from '../contract.ts';
import { invalidInput } from '../errors.ts';
import type { ComputePool } from './compute.ts';
import type { DesignService } from './designs.ts';

function issuesToError(issues: readonly SpecIssue[], prefix: string) {
  const first = issues[0];
  return invalidInput(first?.field ? `${prefix}.${first.field}` : prefix, issues.map((issue) => issue.message).join('; '));
}

/** The server's own analysis (the numbers that count), computed off the event loop. */
export class AnalysisService {
  constructor(
    private readonly compute: ComputePool,
    private readonly designs: DesignService,
  ) {}

  async analyzeSpec(spec: LoopSpec): Promise<AnalysisResult> {
    const outcome = await this.compute.run({ kind: 'analysis', spec });
    if (!outcome.ok) throw issuesToError(outcome.issues, 'spec');
    return outcome.analysis;
  }

  async analyzeStoredDesign(organizationId: number, designId: number): Promise<AnalysisResponse> {
    const design = await this.designs.get(organizationId, designId);
    return { analysis: await this.analyzeSpec(design.spec), designId: design.id, revision: design.revision };
  }
}
