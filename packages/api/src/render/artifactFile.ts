/** One rendered file of a release: its bytes and their SHA-256. */
import { sha256Hex } from './digest.ts';

export interface ArtifactFile {
  readonly name: string;
  readonly mediaType: string;
  readonly bytes: Buffer;
  readonly sha256: string;
}

export function artifactFile(name: string, mediaType: string, text: string): ArtifactFile {
  const bytes = Buffer.from(text, 'utf8');
  return { name, mediaType, bytes, sha256: sha256Hex(bytes) };
}
