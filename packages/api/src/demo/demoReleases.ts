/**
 * Plays the demo story (scenario.ts) through a running Loopwright server over HTTP, signed in as the
 * demo accounts, so every release, verdict, review, mail, download and conformance result is made by
 * the same routes, services and background verification a person would use. It runs only when the
 * demo designs exist and none of them has a release yet (a database someone has worked in is left
 * alone).
 */
import { CSRF_HEADER, CSRF_HEADER_VALUE, type DesignListItem, type DesignRecord, type ProjectRecord, type ReleaseRecord } from '@loopwright/contract';
import type { LoopSpec } from '@loopwright/dsp';
import { DEMO_CAPTURES, DEMO_STORIES, FAILING_FROM_SAMPLE, FAILING_RUN, type DemoRevision } from './scenario.ts';

export interface DemoAccounts {
  readonly designer: string;
  readonly reviewer: string;
  readonly firmware: string;
  readonly password: string;
}

export type DemoReleasesResult = { seeded: true; releases: number; seconds: number } | { seeded: false; reason: string };

class Session {
  constructor(
    private readonly baseUrl: string,
    private readonly cookie: string,
  ) {}

  static async signIn(baseUrl: string, email: string, password: string): Promise<Session | null> {
    const response = await fetch(`${baseUrl}/api/session`, { method: 'POST', headers: { [CSRF_HEADER]: CSRF_HEADER_VALUE, 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
    if (response.status === 401) return null;
    if (!response.ok) throw new Error(`signing in as ${email} answered ${response.status}: ${await response.text()}`);
    const cookie = response.headers.get('set-cookie')?.split(';')[0];
    if (!cookie) throw new Error(`signing in as ${email} set no session cookie`);
    return new Session(baseUrl, cookie);
  }

  async raw(path: string, init: { method?: string; json?: unknown; form?: FormData } = {}): Promise<Response> {
    const headers: Record<string, string> = { [CSRF_HEADER]: CSRF_HEADER_VALUE, cookie: this.cookie };
    if (init.json !== undefined) headers['content-type'] = 'application/json';
    const response = await fetch(`${this.baseUrl}/api${path}`, {
      method: init.method ?? (init.json !== undefined || init.form ? 'POST' : 'GET'),
      headers,
      body: init.json !== undefined ? JSON.stringify(init.json) : init.form,
    });
    if (!response.ok) throw new Error(`${init.method ?? 'GET'} /api${path} answered ${response.status}: ${(await response.text()).slice(0, 400)}`);
    return response;
  }

  async json<T>(path: string, init: { method?: string; json?: unknown; form?: FormData } = {}): Promise<T> {
    return (await (await this.raw(path, init)).json()) as T;
  }

  async bytes(path: string): Promise<Buffer> {
    return Buffer.from(await (await this.raw(path)).arrayBuffer());
  }
}

/** The golden CSV with the filter output one LSB low on FAILING_RUN samples (scenario.ts). */
export function truncatingCapture(golden: string): string {
  const lines = golden.split('\n');
  const header = (lines[0] ?? '').split(',');
  const column = header.indexOf('filter_code');
  if (column < 0) throw new Error('the golden vectors have no filter_code column');
  for (let sample = FAILING_FROM_SAMPLE; sample < FAILING_FROM_SAMPLE + FAILING_RUN; sample++) {
    const cells = (lines[sample + 1] ?? '').split(',');
    if (cells.length !== header.length) throw new Error(`the golden vectors have no sample ${sample}`);
    cells[column] = String(Number(cells[column]) - 1);
    lines[sample + 1] = cells.join(',');
  }
  return lines.join('\n');
}

async function waitForVerdict(designer: Session, releaseId: number, timeoutS: number): Promise<string> {
  const until = Date.now() + timeoutS * 1000;
  for (;;) {
    const v = await designer.json<{ verdict: string | null; summary: string }>(`/releases/${releaseId}/verification`);
    if (v.verdict !== null) return v.summary;
    if (Date.now() > until) throw new Error(`the server did not verify release ${releaseId}'s reference RTL within ${timeoutS} s (${v.summary})`);
    await new Promise((resolve) => setTimeout(resolve, 500));
  }
}

interface Cut {
  readonly release: ReleaseRecord;
  readonly revision: DemoRevision;
}

export async function seedDemoReleases(baseUrl: string, accounts: DemoAccounts, log: (line: string) => void, verdictTimeoutS = 600): Promise<DemoReleasesResult> {
  const started = Date.now();
  const designer = await Session.signIn(baseUrl, accounts.designer, accounts.password);
  const reviewer = await Session.signIn(baseUrl, accounts.reviewer, accounts.password);
  const firmware = await Session.signIn(baseUrl, accounts.firmware, accounts.password);
  if (!designer || !reviewer || !firmware) return { seeded: false, reason: 'the demo accounts do not sign in with the demo password' };

  const { projects } = await designer.json<{ projects: ProjectRecord[] }>('/projects');
  const designs: DesignListItem[] = [];
  for (const project of projects) designs.push(...(await designer.json<{ designs: DesignListItem[] }>(`/projects/${project.id}/designs`)).designs);
  const stories = DEMO_STORIES.map((story) => ({ story, design: designs.find((d) => d.name === story.designName) }));
  const missing = stories.find((s) => !s.design);
  if (missing) return { seeded: false, reason: `the demo design "${missing.story.designName}" is not there` };
  if (designs.some((d) => d.releaseCount > 0)) return { seeded: false, reason: 'the demo designs already have releases' };
  const { reviewers } = await designer.json<{ reviewers: { id: number; email: string }[] }>('/reviewers');
  const reviewerId = reviewers.find((r) => r.email === accounts.reviewer)?.id;
  if (reviewerId === undefined) return { seeded: false, reason: `${accounts.reviewer} is not a reviewer` };

  /** Saves the revision's spec as the design's next revision (the first is the seeded one) and cuts it. */
  const cutRevision = async (designId: number, base: LoopSpec, revision: DemoRevision, index: number): Promise<Cut> => {
    if (index > 0) {
      const current = await designer.json<DesignRecord>(`/designs/${designId}`);
      await designer.json(`/designs/${designId}`, { method: 'PUT', json: { baseRevision: current.revision, spec: revision.edit(base) } });
    }
    const release = await designer.json<ReleaseRecord>(`/designs/${designId}/releases`, { method: 'POST' });
    log(`${release.designName} ${release.label}: ${revision.change}`);
    return { release, revision };
  };
  const requestReview = (releaseId: number) => designer.json(`/releases/${releaseId}/reviews`, { method: 'POST', json: { reviewerIds: [reviewerId], approvalsRequired: 1 } });
  const decide = (cut: Cut, decision: 'approve' | 'request-changes', comment?: string) =>
    reviewer.json(`/releases/${cut.release.id}/reviews/decision`, { method: 'POST', json: { decision, manifestSha256: cut.release.manifestSha256, ...(comment ? { comment } : {}) } });

  // Every v1 first: their verifications are queued first, so the approvals wait least.
  const bases = new Map<number, LoopSpec>();
  const firsts: Cut[] = [];
  for (const { story, design } of stories) {
    const record = await designer.json<DesignRecord>(`/designs/${design!.id}`);
    bases.set(design!.id, record.spec as LoopSpec);
    const cut = await cutRevision(design!.id, record.spec as LoopSpec, story.revisions[0]!, 0);
    await requestReview(cut.release.id);
    firsts.push(cut);
  }

  let count = firsts.length;
  for (const { story, design } of stories) {
    const base = bases.get(design!.id)!;
    for (const [index, revision] of story.revisions.entries()) {
      if (index === 0) continue;
      const cut = await cutRevision(design!.id, base, revision, index);
      count++;
      const fate = revision.fate;
      if (fate.kind === 'changes-requested') {
        await requestReview(cut.release.id);
        await decide(cut, 'request-changes', fate.comment);
      } else if (fate.kind === 'withdrawn') {
        await designer.json(`/releases/${cut.release.id}/withdraw`, { method: 'POST', json: { reason: fate.reason } });
      } else if (fate.kind === 'in-review') {
        await requestReview(cut.release.id);
      }
    }
  }

  // Approval waits for the server's verdict on the reference RTL, as a reviewer's would.
  for (const cut of firsts) {
    log(`${cut.release.designName} ${cut.release.label}: waiting for the server's RTL verification`);
    log(`${cut.release.designName} ${cut.release.label}: ${await waitForVerdict(designer, cut.release.id, verdictTimeoutS)}`);
    await decide(cut, 'approve');
    const files = cut.release.files.map((f) => f.name);
    const vectors = files.find((n) => n.endsWith('_vectors.csv'));
    const header = files.find((n) => n.endsWith('.h'));
    if (!vectors || !header) throw new Error(`${cut.release.designName} ${cut.release.label} has no vectors or C header`);
    await firmware.bytes(`/releases/${cut.release.id}/bundle`);
    await firmware.bytes(`/releases/${cut.release.id}/files/${encodeURIComponent(header)}`);
    const golden = (await firmware.bytes(`/releases/${cut.release.id}/files/${encodeURIComponent(vectors)}`)).toString('utf8');
    for (const [name, text] of [
      [DEMO_CAPTURES.bitExact, golden],
      [DEMO_CAPTURES.failing, truncatingCapture(golden)],
    ] as const) {
      const form = new FormData();
      form.append('file', new Blob([text], { type: 'text/csv' }), name);
      const run = await firmware.json<{ verdict: string; mismatchCount: number }>(`/releases/${cut.release.id}/conformance`, { form });
      log(`${cut.release.designName} ${cut.release.label}: ${name} ${run.verdict}${run.mismatchCount ? ` (${run.mismatchCount} mismatches)` : ''}`);
    }
  }
  return { seeded: true, releases: count, seconds: Math.round((Date.now() - started) / 1000) };
}
