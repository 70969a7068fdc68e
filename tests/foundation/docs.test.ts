/**
 * The repository carries its own design documents (docs/DESIGN.md, docs/REFERENCES.md): every
 * citation in the code resolves inside a fresh clone. A citation key is an author or title initial and
 * a year or edition (TRG71, OS3, IEEE754); a section is cited by its heading (DESIGN.md "The flow").
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT } from '../../scripts/lib/process.ts';

const KEY_SHAPE = /\b[A-Z][A-Za-z]{0,4}[0-9]{1,4}\b/g;
/** Words of the key shape that are not citations, each with what it is. */
const NOT_CITATIONS: Readonly<Record<string, string>> = {
  C11: 'the C standard the header targets',
  IPv6: 'an address family',
  O2: 'the gcc optimisation flag -O2',
  SHA256: 'the hash function SHA-256',
  C0: 'the C0 control characters (U+0000-U+001F)',
  C1: 'the C1 control characters (U+0080-U+009F)',
  E0: 'a byte of a percent-encoded path (%E0)',
  A4: 'a byte of a percent-encoded path (%A4)',
  L1: 'the L1 norm (sum of absolute values of an impulse response)',
  L2: 'the L2 norm (root of the sum of squares of an impulse response)',
};

/** Q formats (Q1.15, Q2.16: integer and fraction bits of a word) have the key shape too. */
const Q_FORMAT = /^Q[0-9]+$/;

function trackedFiles(): string[] {
  return execFileSync('git', ['ls-files', '--cached', '--others', '--exclude-standard'], { cwd: ROOT, encoding: 'utf8' }).split('\n').filter((f) => f !== '');
}

function read(file: string): string {
  return readFileSync(path.join(ROOT, file), 'utf8');
}

/** Comment text of a source file, and the titles of its tests (which name their sources too). */
function commentsOf(file: string, text: string): string {
  if (/\.(md)$/.test(file)) return text;
  const parts: string[] = [];
  if (/\.(py)$/.test(file)) {
    for (const m of text.matchAll(/#(.*)$/gm)) parts.push(m[1]!);
    for (const m of text.matchAll(/"""([\s\S]*?)"""/g)) parts.push(m[1]!);
  } else {
    for (const m of text.matchAll(/\/\*([\s\S]*?)\*\//g)) parts.push(m[1]!);
    for (const m of text.matchAll(/(?:^|[^:'"`])\/\/(.*)$/gm)) parts.push(m[1]!);
    for (const m of text.matchAll(/<!--([\s\S]*?)-->/g)) parts.push(m[1]!);
    for (const m of text.matchAll(/\{\{!--([\s\S]*?)--\}\}/g)) parts.push(m[1]!);
    for (const m of text.matchAll(/\b(?:describe|it)\(\s*(['"`])(.*?)\1/g)) parts.push(m[2]!);
  }
  return parts.join('\n');
}

const SOURCE = /\.(ts|mts|mjs|js|vue|py|c|h|hbs|md)$/;

function citingFiles(): { file: string; comments: string }[] {
  return trackedFiles()
    .filter((f) => SOURCE.test(f) && f !== 'docs/REFERENCES.md' && f !== 'tests/foundation/docs.test.ts')
    .map((file) => ({ file, comments: commentsOf(file, read(file)) }));
}

function bibliographyKeys(): Set<string> {
  const text = read('docs/REFERENCES.md');
  const table = text.slice(text.indexOf('## Bibliography'), text.indexOf('\n## ', text.indexOf('## Bibliography') + 1));
  return new Set([...table.matchAll(/^\| ([A-Za-z0-9]+) \|/gm)].map((m) => m[1]!).filter((k) => k !== 'key'));
}

function headings(file: string): Set<string> {
  return new Set([...read(file).matchAll(/^#{2,4} (.+)$/gm)].map((m) => m[1]!.trim()));
}

describe('docs/ holds what the code cites', () => {
  const files = citingFiles();
  const keys = bibliographyKeys();

  it('lists the bibliography keys in a table', () => {
    expect(keys.size).toBeGreaterThanOrEqual(10);
    expect(keys.has('TRG71')).toBe(true);
  });

  it('has every citation key used in a comment or test title in its bibliography', () => {
    const unknown = files.flatMap(({ file, comments }) =>
      [...new Set(comments.match(KEY_SHAPE) ?? [])].filter((k) => !keys.has(k) && !(k in NOT_CITATIONS) && !Q_FORMAT.test(k)).map((k) => `${file}: ${k}`),
    );
    expect(unknown).toEqual([]);
  });

  it('cites every entry of its bibliography somewhere (no dead entries)', () => {
    const cited = new Set(files.flatMap(({ comments }) => comments.match(KEY_SHAPE) ?? []));
    expect([...keys].filter((k) => !cited.has(k))).toEqual([]);
  });

  it('has every section a comment cites as DESIGN.md "Heading" or REFERENCES.md, Heading', () => {
    const design = headings('docs/DESIGN.md');
    const references = headings('docs/REFERENCES.md');
    const missing: string[] = [];
    for (const { file, comments } of files) {
      for (const m of comments.matchAll(/DESIGN\.md,?\s\(?"([A-Z][^"]+)"/g)) if (!design.has(m[1]!)) missing.push(`${file}: DESIGN.md "${m[1]}"`);
      for (const m of comments.matchAll(/REFERENCES\.md, ([A-Z][a-z]+(?: [a-z]+)*)/g)) if (!references.has(m[1]!)) missing.push(`${file}: REFERENCES.md, ${m[1]}`);
    }
    expect(missing).toEqual([]);
  });

  it('keeps DESIGN.md and REFERENCES.md only under docs/, so a bare citation has one file to mean', () => {
    const docs = trackedFiles().filter((f) => /(^|\/)(DESIGN|REFERENCES)\.md$/.test(f));
    expect(docs.sort()).toEqual(['docs/DESIGN.md', 'docs/REFERENCES.md']);
  });

  it('points at no path outside the repository (no absolute path of a machine)', () => {
    const offending = trackedFiles()
      .filter((f) => SOURCE.test(f) || /\.(json|yaml|sh)$/.test(f) || f === '.ci/run')
      .filter((f) => f !== 'pnpm-lock.yaml' && /\/(work|home)\/[\w.-]/.test(read(f)));
    expect(offending).toEqual([]);
  });

  it('finds a key that is not in the bibliography (the check above can fail)', () => {
    const found = commentsOf('x.ts', "const a = 1; // after Smith (Sm99)\nit('cites (G3)', () => {});").match(KEY_SHAPE);
    expect(found).toEqual(['Sm99', 'G3']);
    expect(keys.has('Sm99')).toBe(false);
  });
});
