/** A spec the test holds to be releasable, computed and rendered as a cut or `loopwright render` would. */
import { renderArtifacts, type RenderedRelease } from '../../src/render/artifacts.ts';
import { computeRelease } from '../../src/render/compute.ts';

export function renderRelease(spec: unknown): RenderedRelease {
  const computed = computeRelease(spec);
  if (!computed.ok) throw new Error(`not releasable: ${computed.issues.map((i) => i.message).join('; ')}`);
  return renderArtifacts(computed.release);
}
