/** The banner every generated code file opens with (all fields are our own text or hex digests). */
export interface ArtifactHeader {
  readonly fileName: string;
  readonly designName: string;
  readonly toolVersion: string;
  readonly specSha256: string;
  readonly caution: string;
}
