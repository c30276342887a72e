/**
 * Copies a tree node by node with `convert` (which returns its output with an empty `children`),
 * keeping child order, without recursion: a shown path may be far deeper than the call stack.
 */
export function mapTree<In extends { children: In[] }, Out extends { children: Out[] }>(
  root: In,
  convert: (node: In) => Out,
): Out {
  const out = convert(root);
  const stack: [In, Out][] = [[root, out]];
  for (let top = stack.pop(); top !== undefined; top = stack.pop()) {
    const [node, copy] = top;
    for (const child of node.children) {
      const converted = convert(child);
      copy.children.push(converted);
      stack.push([child, converted]);
    }
  }
  return out;
}
