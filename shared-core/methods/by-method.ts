/** A list of definitions as a table by method name, each entry typed as its own definition. */
export function byMethod<D extends { method: string }>(
  definitions: readonly D[],
): { [M in D['method']]: Extract<D, { method: M }> } {
  const table: Record<string, D> = {};
  for (const d of definitions) {
    if (table[d.method] !== undefined) throw new Error(`method '${d.method}' is defined twice`);
    table[d.method] = d;
  }
  return table as { [M in D['method']]: Extract<D, { method: M }> };
}
