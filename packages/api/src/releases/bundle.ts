/**
 * The release bundle: a zip of every artifact, manifest.json first, streamed (archiver's ZipArchive)
 * so the response starts before the archive is complete. Entry dates are the release's cut time, so
 * the same release always zips to the same bytes.
 */
import type { Writable } from 'node:stream';
import { ZipArchive } from 'archiver';

export interface BundleEntry {
  readonly name: string;
  readonly content: Buffer;
}

export function bundleFolder(designName: string, number: number): string {
  return `${designName}-v${number}`;
}

export async function writeBundle(out: Writable, folder: string, entries: readonly BundleEntry[], date: Date): Promise<void> {
  const zip = new ZipArchive({ zlib: { level: 6 } });
  const failed = new Promise<never>((_resolve, reject) => zip.on('error', reject));
  zip.pipe(out);
  for (const e of entries) zip.append(e.content, { name: `${folder}/${e.name}`, date });
  await Promise.race([zip.finalize(), failed]);
}
