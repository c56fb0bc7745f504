/** A plain-text table: the first column left-aligned, the figures right-aligned, two spaces apart. */
export function textTable(
  header: readonly string[],
  rows: readonly (readonly string[])[],
  numeric?: readonly boolean[],
): string[] {
  const widths = header.map((h, j) => Math.max(h.length, ...rows.map((r) => r[j].length)));
  const right = (j: number) => (numeric ? numeric[j] : j > 0);
  const line = (cells: readonly string[]) =>
    cells
      .map((c, j) => (right(j) ? c.padStart(widths[j]) : c.padEnd(widths[j])))
      .join('  ')
      .trimEnd();
  return [line(header), ...rows.map(line)];
}

/** One CSV field: quoted when it holds a comma, a quote or a line break (RFC 4180). */
export function csvField(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
