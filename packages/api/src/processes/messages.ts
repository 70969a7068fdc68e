/** What a serving process tells its supervisor over the IPC channel once it accepts connections. */
export const LISTENING_MESSAGE = 'loopwright:listening';

export interface ListeningMessage {
  readonly type: typeof LISTENING_MESSAGE;
  readonly port: number;
}

export function isListeningMessage(value: unknown): value is ListeningMessage {
  return typeof value === 'object' && value !== null && (value as { type?: unknown }).type === LISTENING_MESSAGE && typeof (value as { port?: unknown }).port === 'number';
}
