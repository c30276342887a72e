import type { HierarchyNode } from "d3-hierarchy";
import type { PrintedNames } from "../model/printed-names.js";
import { buildView, type ViewInput } from "../view/build-view.js";
import { hierarchyOf } from "../view/hierarchy-of.js";
import type { Folded, ViewNode } from "../view/view-node.js";
import { type ChangeCounts, type ChangeKind, changeKinds, KIND, kindName, noChanges } from "./changes.js";
import type { Combined } from "./combine.js";
import type { DiffInterest } from "./diff-interest.js";
import { type FieldEdit, fieldEdits } from "./field-edits.js";
import { type ChangeMeasures, changesIn, netIn } from "./measure-changes.js";

/** What is folded under a shown node of a diff: the summary's counts plus the changes inside. */
export interface DiffFolded extends Folded {
  /** Changed nodes inside the hidden children's subtrees, per kind. */
  changes: ChangeCounts;
  /** Net size change inside them (sum of own size changes). */
  delta: number;
}

/** A shown node of a diff. `nodes` counts the combined tree (removed nodes included); `size` is new. */
export interface DiffViewNode extends Omit<ViewNode, "children" | "hidden"> {
  change: ChangeKind | null;
  /** Own size change: new minus old (a removed node: minus its old size). */
  delta: number;
  /** Sum of own size changes over the subtree. */
  net: number;
  /** Changed nodes in the subtree, this node included, per kind. */
  changes: ChangeCounts;
  /** A moved node's old parent (graphs: the parent an unlinked full entry lost), a path in the old version. */
  movedFrom: string | null;
  /** A renamed node's old name; a moved node's too when it has a new one. */
  renamedFrom: string | null;
  /**
   * The compared fields whose value differs (`--compare-field`), whatever the node's kind (a moved
   * node can be edited too); empty for an added or removed node and when no field is compared.
   */
  edits: FieldEdit[];
  children: DiffViewNode[];
  hidden: DiffFolded | null;
}

/** What a diff's view is built from: a view's input on the combined tree, and the changes. */
export interface DiffViewInput extends Omit<ViewInput, "scores" | "parentsOf"> {
  readonly scores: DiffInterest;
  readonly combined: Combined;
  readonly changes: ChangeMeasures;
  /**
   * Names and paths in the old version, for the "moved from" and "renamed from" notes, and how a
   * compared field's value prints (a keyed pseudonym under `--pseudonymize`).
   */
  readonly old: PrintedNames;
}

/**
 * The shown nodes of a combined tree as a d3-hierarchy tree (see `buildView`; built by `hierarchyOf`,
 * in linear time however deep), each carrying its change and the changes folded under it, so that at
 * every shown node each count and the net size change equal the node's own plus its shown children's
 * plus its folded remainder's.
 */
export function buildDiffView(input: DiffViewInput): HierarchyNode<DiffViewNode> {
  const { index, combined, changes, scores, selection, old } = input;
  const base = buildView(input);
  const { count } = index.measures;
  const { kind, deltaOf, oldIndex, newIndex, oldTree, compared } = combined;
  const byIndex = new Map<number, DiffViewNode>();
  let root: DiffViewNode | undefined;
  base.eachBefore(({ data }) => {
    const i = data.index;
    const o = oldIndex[i];
    const k = kind[i];
    let hidden: DiffFolded | null = null;
    if (data.hidden) {
      const inside: ChangeCounts = noChanges();
      let net = 0;
      const end = i + count[i];
      for (let c = i + 1; c < end; c += count[c]) {
        if (selection.isShown(c) || changes.onChangePath[c] === 0) continue;
        const counts = changesIn(changes, c);
        for (const k of changeKinds) inside[k] += counts[k];
        net += netIn(changes, c);
      }
      hidden = { ...data.hidden, changes: inside, delta: net };
    }
    const node: DiffViewNode = {
      ...data,
      onPath: data.onPath || scores.onChangePath[i] === 1,
      change: kindName(k),
      delta: deltaOf(i),
      net: netIn(changes, i),
      changes: changesIn(changes, i),
      movedFrom:
        k === KIND.moved || (k === KIND.unlinked && combined.newIndex[i] >= 0 && data.reference === undefined)
          ? old.pathOf(oldTree.parent[o])
          : null,
      // A moved node that also has a new name says its old one too (one kind each: moved wins).
      renamedFrom:
        k === KIND.renamed || (k === KIND.moved && oldTree.name.get(o) !== index.tree.name.get(i))
          ? old.nameOf(o)
          : null,
      edits:
        compared === null || o < 0 || newIndex[i] < 0
          ? []
          : fieldEdits(compared, o, newIndex[i]).map((e) => ({
              field: e.field,
              old: old.valueOf(e.old),
              new: old.valueOf(e.new),
            })),
      children: [],
      hidden,
    };
    byIndex.set(i, node);
    if (i === 0) root = node;
    else byIndex.get(index.tree.parent[i])!.children.push(node);
  });
  return hierarchyOf(root!);
}
