import { EspalierError, quotedList, say } from "../errors.js";
import { ITEM_NAME_FIELD } from "../load/load-options.js";
import type { PrintedNames } from "../model/printed-names.js";
import type { Tree } from "../model/tree.js";

const FIELD = /\{([^{}]+)\}/g;

/** Fields a label template reads, other than the built-in name, id and path. */
export function templateFields(template: string): string[] {
  const out = new Set<string>();
  for (const m of template.matchAll(FIELD)) if (!["name", "id", "path"].includes(m[1])) out.add(m[1]);
  return [...out];
}

/**
 * Compiles a label template such as "{title}, {team}": `{field}` is replaced by the node's value of
 * that record field; `{name}`, `{id}` and `{path}` are built in. Every part is printed as `names`
 * prints it: under `--pseudonymize` a field's value (a title, an e-mail address) is its keyed
 * pseudonym like a name, since any field of a person's record may point at the person. A field the
 * input lacks is an error.
 */
export function compileLabel(
  template: string | undefined,
  tree: Tree,
  names: PrintedNames,
): (i: number) => string {
  const { nameOf, pathOf } = names;
  if (template === undefined) {
    const items = tree.reading?.shape === "values" ? tree.fields.get(ITEM_NAME_FIELD) : undefined;
    if (items === undefined) template = "{name}";
    else return (i) => (items[i] ? `${nameOf(i)} name=${names.valueOf(items[i])}` : nameOf(i));
  }
  const idOf = (i: number) => names.idOf(i) ?? "";
  const parts = template.split(FIELD); // even: literal text, odd: field names
  const getters = parts.map((part, k): ((i: number) => string) => {
    if (k % 2 === 0) return () => part;
    if (part === "name") return nameOf;
    if (part === "path") return pathOf;
    if (part === "id") {
      if (!tree.ids)
        throw new EspalierError("FIELD_MISSING", `the label uses {id} but the input has no id column`);
      return idOf;
    }
    const values = tree.fields.get(part);
    if (!values) {
      const have = ["name", "path", ...(tree.ids ? ["id"] : []), ...tree.fields.keys()];
      // The fields are the input's own column names: marked, so --pseudonymize hides them.
      throw new EspalierError(
        "FIELD_MISSING",
        say`the label uses {${part}}; fields available: ${quotedList("name", have)}`,
      );
    }
    const printValue = names.valueOf;
    return (i) => printValue(values[i] ?? "");
  });
  return (i) => {
    let s = "";
    for (const g of getters) s += g(i);
    // A synthetic root has no record: fall back to its name rather than an empty label.
    return s.trim() === "" && tree.parent[i] < 0 ? nameOf(i) : s;
  };
}
