/**
 * A graph table's other column whose cells differ between the rows of one id (`--graph`, where a row
 * links its id to one parent): such a cell describes the edge, not the node (a `since` or `role` per
 * parent). Each node whose rows differ so gets as its value its rows' cells by parent id, as JSON text
 * of an object with the parents in code-unit order (`{"billing-api":"reads","ledger":"owns"}`): a cell
 * changed in any row changes the node's value, and the same rows in another order do not. A node whose
 * rows agree, or leave the cell empty after the first (when `emptyRepeats`: a record's later row may),
 * keeps the first row's cell. `values` (a value by node, each the node's first row's cell) is changed
 * in place; `cells` are the column's, by row.
 */
export function valuesByParent(
  values: string[],
  cells: readonly string[],
  parentOf: (row: number) => string,
  nodeOfRow: Int32Array,
  emptyRepeats = true,
): void {
  const byNode = new Map<number, [string, string][]>();
  for (let r = 0; r < nodeOfRow.length; r++) {
    const node = nodeOfRow[r];
    if (cells[r] !== values[node] && (cells[r] !== "" || !emptyRepeats)) byNode.set(node, []);
  }
  for (let r = 0; r < nodeOfRow.length; r++) byNode.get(nodeOfRow[r])?.push([parentOf(r), cells[r]]);
  for (const [node, pairs] of byNode) {
    pairs.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    values[node] = `{${pairs.map(([p, c]) => `${JSON.stringify(p)}:${JSON.stringify(c)}`).join(",")}}`;
  }
}
