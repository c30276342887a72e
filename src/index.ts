// espalier's public API: load once, then summarise for any foci and budget.

export { type ChangeCounts, type ChangeKind, changeKinds } from "./diff/changes.js";
export {
  type CompareOptions,
  type DiffOptions,
  type DiffResult,
  diffTrees,
  prepareDiff,
  summarizeDiff,
} from "./diff/diff-trees.js";
export type { DiffFolded, DiffViewNode } from "./diff/diff-view.js";
export type { DiffTotals, PreparedDiff } from "./diff/prepared-diff.js";
export {
  type ErrorCode,
  type ErrorDetails,
  EspalierError,
  errorCodes,
  formatPos,
  type InputText,
  type MessagePart,
  type SourcePos,
} from "./errors.js";
export {
  type ChildrenInOrder,
  type Ranked,
  type Selection,
  type SelectOptions,
  select,
} from "./fit/select.js";
export type { FocusSpec, ListedFocus, UnmatchedFoci } from "./focus/focus-spec.js";
export { resolveFoci } from "./focus/resolve.js";
export { type ResolvedFoci, resolveSpecs } from "./focus/resolve-specs.js";
export { fromArrays, type Interest, interest } from "./interest/doi.js";
export { type Importance, importance, importances } from "./interest/importance.js";
export { interestNear } from "./interest/near.js";
export { type NodeOrder, nodeOrder } from "./interest/order.js";
export { FAR, type Scores } from "./interest/scores.js";
export { detectFormat, type FieldNames } from "./load/detect-format.js";
export { loadTree } from "./load/index.js";
export { defaultLoadOptions, type InputFormat, inputFormats, type LoadOptions } from "./load/load-options.js";
export { loadTreeFromStream } from "./load/stream/index.js";
export { buildTree } from "./model/build-tree.js";
export { CHAIN_JOIN } from "./model/chain-join.js";
export type { LinkedNodes } from "./model/linked-nodes.js";
export { type MeasureMemory, type Measures, measure } from "./model/measure.js";
export { type Names, namesToArray, StringNames } from "./model/names.js";
export { PathIndex } from "./model/path-index.js";
export { escapeSegment, parseSegment, splitPath } from "./model/segment.js";
export type { Tree } from "./model/tree.js";
export type { NumberOptions } from "./render/amount.js";
export { type DiffJsonOptions, renderDiffJson, toDiffSummary } from "./render/diff-json.js";
export { renderDiffMarkdown } from "./render/diff-markdown.js";
export { DIFF_FORMAT, type DiffSummary, diffSchema } from "./render/diff-schema.js";
export { type DiffTextOptions, renderDiffText } from "./render/diff-text.js";
export { formatSize, type Units } from "./render/format-size.js";
export { type HeaderOptions, type HeaderStyle, summaryHeader, summaryHeaderLines } from "./render/header.js";
export { renderSvg, type SvgOptions } from "./render/icicle-svg.js";
export {
  KEY_MIN_BUDGET,
  KEY_MOST_ROWS,
  KEY_ONE_ROW,
  type KeyContext,
  type KeyFacts,
  keyContext,
  keyFacts,
  keyLine,
  keyLines,
  keyMostRows,
  keyRows,
  keyRowsNeeded,
  type WidthCuts,
} from "./render/key-line.js";
export { type LineGroup, lineGroups } from "./render/line-groups.js";
export {
  type LaidOutLine,
  type LayoutOptions,
  type LineParts,
  laidOutLine,
  layoutLine,
  MIN_WIDTH,
} from "./render/line-layout.js";
export { lineParts } from "./render/line-parts.js";
export { LEGEND_LINES, legendLines, MARK } from "./render/marks.js";
export { type Palette, palette } from "./render/palette.js";
export { type ScreenLines, screenLines } from "./render/screen-lines.js";
export { type JsonOptions, renderJson, toSummary } from "./render/summary-json.js";
export { type MarkdownOptions, renderMarkdown } from "./render/summary-markdown.js";
export { SUMMARY_FORMAT, type Summary, summarySchema } from "./render/summary-schema.js";
export { renderText, type TextOptions } from "./render/summary-text.js";
export { type Prepared, prepare, type SummarizeOptions, type SummaryResult, summarize } from "./summarize.js";
export type { SummaryOptions } from "./summary-options.js";
export type { Folded, ViewNode } from "./view/view-node.js";
