/** A fault of the machine or its set-up, reported to the user as one clear line (no stack). */
export class StartupError extends Error {
  override readonly name = 'StartupError';
}
