/**
 * A field's values by node: `values[k]` at node `nodes[k]`, "" at every other of the `length` nodes;
 * undefined when there are none, or more than `most`.
 */
export function byNode(
  length: number,
  nodes: readonly number[],
  values: readonly string[],
  most: number,
): string[] | undefined {
  if (nodes.length === 0 || nodes.length > most) return undefined;
  const out = new Array<string>(length).fill("");
  for (let k = 0; k < nodes.length; k++) out[nodes[k]] = values[k];
  return out;
}
