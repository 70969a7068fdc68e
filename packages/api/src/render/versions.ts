/** Versions a manifest records: the tool, the dsp library and a digest of the templates used. */
import { readFileSync } from 'node:fs';
import { sha256Hex } from './digest.ts';
import { TEMPLATE_FILES, templateSource } from './templates.ts';

function packageVersion(relativeUrl: string): string {
  const pkg = JSON.parse(readFileSync(new URL(relativeUrl, import.meta.url), 'utf8')) as { version?: unknown };
  if (typeof pkg.version !== 'string') throw new Error(`${relativeUrl} has no version`);
  return pkg.version;
}

export interface ToolVersions {
  readonly loopwright: string;
  readonly dsp: string;
  readonly specVersion: 1;
  /** SHA-256 over the template sources in a fixed order: which wording produced the files. */
  readonly templatesSha256: string;
}

let cached: ToolVersions | undefined;

export function toolVersions(): ToolVersions {
  cached ??= {
    loopwright: packageVersion('../../../../package.json'),
    dsp: packageVersion('../../../dsp/package.json'),
    specVersion: 1,
    templatesSha256: sha256Hex(
      Object.keys(TEMPLATE_FILES)
        .sort()
        .map((id) => templateSource(id as keyof typeof TEMPLATE_FILES))
        .join('\u0000'),
    ),
  };
  return cached;
}
