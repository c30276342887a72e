import { isPair, type Node, YAMLMap } from "yaml";

/**
 * A sequence's items as nodes. An ordered map or a list of pairs (`!!omap`, `!!pairs`, the YAML 1.1
 * types yaml.org/type/omap.html and pairs.html, which the yaml package reads also in 1.2 documents)
 * holds each `- key: value` as a bare pair, no node: each such item is the one-key mapping it is
 * written as, spanning its key and value, so its key and value are read, and counted, as any
 * mapping's. Other items are returned as they are.
 */
export function pairItems(items: readonly unknown[]): (Node | null)[] {
  return items.map((item) => {
    if (!isPair(item)) return (item ?? null) as Node | null;
    const map = new YAMLMap();
    map.items.push(item);
    const key = item.key as Node | null;
    const value = item.value as Node | null;
    const start = key?.range?.[0] ?? value?.range?.[0];
    const end = value?.range?.[1] ?? key?.range?.[1];
    if (start !== undefined && end !== undefined) map.range = [start, end, end];
    return map;
  });
}
