/** One rendered file of a release: its bytes and their SHA-256, bounded in size. */
import { RenderInputError } from './compute.ts';
import { sha256Hex } from './digest.ts';

export interface ArtifactFile {
  readonly name: string;
  readonly mediaType: string;
  readonly bytes: Buffer;
  readonly sha256: string;
}

/**
 * Largest file a release may hold. The spec's limits keep every file far below it (at 16 sine-table
 * address bits and 32-bit codes the largest, the Verilog include, is about 3.6 MB); the bound makes
 * sure no future template or limit can produce a file that fills the disk or the download.
 */
export const MAX_ARTIFACT_BYTES = 16 * 1024 * 1024;

/** Refuses a file over the bound, naming the spec field that sizes the tables in every file. */
export function checkArtifactSize(name: string, bytes: number, limitBytes = MAX_ARTIFACT_BYTES): void {
  if (bytes > limitBytes) {
    throw new RenderInputError('nco.phaseBits', `nco.phaseBits: ${name} would be ${bytes} bytes, more than the ${limitBytes} a release file may hold; use fewer sine-table address bits`);
  }
}

/** A file of rendered text (UTF-8), or of bytes made as they are stored (the golden vectors' ASCII). */
/**
 * A Uint8Array's bytes viewed as a Buffer, not copied: dsp writes plain Uint8Arrays (it runs in the
 * browser too), and Buffers come back from a worker thread as plain Uint8Arrays (structured clone).
 */
export function asBuffer(bytes: Uint8Array): Buffer {
  return Buffer.isBuffer(bytes) ? bytes : Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

export function artifactFile(name: string, mediaType: string, content: string | Buffer): ArtifactFile {
  const bytes = typeof content === 'string' ? Buffer.from(content, 'utf8') : content;
  checkArtifactSize(name, bytes.length);
  return { name, mediaType, bytes, sha256: sha256Hex(bytes) };
}
