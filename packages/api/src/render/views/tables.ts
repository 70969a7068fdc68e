/** Line layout shared by the table views: entries grouped a few per line, separators precomputed. */
export function groupLines(items: readonly string[], perLine: number, separator: string, lastSeparator: string): { text: string }[] {
  const lines: { text: string }[] = [];
  for (let i = 0; i < items.length; i += perLine) {
    const chunk = items.slice(i, i + perLine);
    const end = i + perLine >= items.length ? lastSeparator : separator;
    lines.push({ text: chunk.join(`${separator} `) + end });
  }
  return lines;
}
