/**
 * A count as a sentence shows it, thousands grouped by commas ("65,536"): the manifest's wording and
 * the messages a person reads are English whatever the server's locale.
 */
export function countText(n: number): string {
  return n.toLocaleString('en');
}
