/**
 * The text to show for something thrown: workers and stores catch `unknown`, and a non-Error
 * (a string posted from a worker, say) should still read as itself rather than as "[object …]".
 */
export function errorText(cause: unknown): string {
  return cause instanceof Error ? cause.message : String(cause);
}
