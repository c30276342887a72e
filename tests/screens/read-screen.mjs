// How a reader without the docs reads one of espalier's screens: the lines' numbers, the marks and
// cuts, and whether the lines above the tree explain them (docs/selection.md: on every line,
// nodes = the line's names + the nodes of the lines below it + what its fold hides). Pure: used by
// check-screens.mjs on real inputs and by screens.test.ts on invented ones.
import stringWidth from "string-width";

export const ANSI = /\u001b\[[0-9;]*m/g;

/** The names a label stands for: a chain's `a / b` is two; `(k more)` is k. */
function namesIn(label) {
  return label
    .split(" / ")
    .map((name) => /^\(([0-9,]+) more\)$/.exec(name))
    .reduce((sum, more) => sum + (more ? num(more[1]) : 1), 0);
}

const num = (s) => Number(s.replaceAll(",", ""));

/** A tree line: its level, mark, names, count (NaN for `?`), fold count (NaN for a bare `(hidden)`). */
function readLine(line) {
  const m = /^( *)(?:([0-9]+) )?([*:.&]) (.*)$/.exec(line);
  if (!m) return null;
  const [, indent, digits, mark, rest] = m;
  const parts = rest.split("  ");
  let label = parts[0];
  // A diff's change tag before the name: `[edited version 1 -> 2] name`.
  label = label.replace(/^\[[^\]]*\] ?/, "");
  const numbers = parts.slice(1).find((p) => !p.startsWith("(")) ?? "";
  const fold = parts.slice(1).find((p) => /^\((hidden|[0-9,]+ hidden)/.test(p)) ?? "";
  // A line without a count is its names and what its fold hides (`mime  (665 hidden)`: 666 nodes).
  let nodes = null;
  if (numbers === "?") nodes = Number.NaN;
  else {
    const c = /^([0-9,]+) nodes?\b/.exec(numbers);
    if (c) nodes = num(c[1]);
  }
  let hidden = 0;
  if (fold === "(hidden)") hidden = Number.NaN;
  else if (fold) {
    const f =
      /^\(hidden: (?:[0-9,]+ child(?:ren)?, )?([0-9,]+) nodes?/.exec(fold) ??
      /^\(([0-9,]+) hidden/.exec(fold);
    if (!f) return { bad: `fold not read: ${fold}` };
    hidden = num(f[1]);
  }
  const names = mark === "&" ? 1 : namesIn(label);
  const counted = nodes !== null;
  if (nodes === null) nodes = names + hidden;
  const shownSize = /^[0-9,]+ nodes?, |^[0-9.,]+ ?[KMGTP]?i?B$|^[0-9.,]+[kMGTP]?$/.test(numbers);
  return {
    level: digits === undefined ? indent.length / 2 : Number(digits),
    digits: digits !== undefined,
    mark,
    label: parts[0],
    names,
    nodes: mark === "&" ? 0 : nodes,
    counted,
    hidden,
    shownSize,
    numbers,
    sizeCut: numbers.includes("size cut"),
  };
}

/**
 * The problems of one text screen (header and key first, then the tree's lines; `graph`: a fold may
 * hide references alone); `noted` is called
 * when the screen says its key was left out (and where it has room: `keyLeftOut`), `partial` when its
 * key says the marks and only part of the rest (`rest: --legend`).
 */
export function checkText(
  text,
  {
    budget,
    width,
    legend,
    key = true,
    kind = "summary",
    graph = false,
    noted = () => {},
    partial = () => {},
  },
) {
  const problems = [];
  const all = text.replace(ANSI, "").trimEnd().split("\n");
  if (all.length > budget) problems.push(`${all.length} lines for a budget of ${budget}`);
  if (width !== undefined)
    for (const l of all) if (stringWidth(l) > width) problems.push(`wider than ${width}: ${l}`);
  // The tree starts at the first line that opens with a mark at column 0 (the root's).
  const start = all.findIndex((l) => /^[*:.&] /.test(l));
  if (start < 0) return [`no root line:\n${text}`];
  const head = all.slice(0, start).join("\n");
  const lines = all.slice(start).map(readLine);
  lines.forEach((l, k) => {
    if (l === null) problems.push(`not a tree line: ${all[start + k]}`);
    else if (l.bad) problems.push(`${l.bad}: ${all[start + k]}`);
  });
  if (problems.length > 0) return problems;
  // nodes = names + the lines below + hidden, on every line (a reference carries no count).
  for (let k = 0; k < lines.length; k++) {
    if (lines[k].mark === "&") continue;
    let below = 0;
    for (let j = k + 1; j < lines.length && lines[j].level > lines[k].level; j++)
      if (lines[j].level === lines[k].level + 1) below += lines[j].nodes;
    const l = lines[k];
    if (Number.isNaN(l.nodes) || Number.isNaN(below)) continue;
    if (Number.isNaN(l.hidden)) {
      // A graph's fold may hold references alone, which carry no count (docs/selection.md, Graphs).
      const least = graph ? 0 : 1;
      if (!(l.nodes >= l.names + below + least))
        problems.push(`a bare fold hides ${graph ? "fewer than none" : "nothing"}: ${all[start + k]}`);
      continue;
    }
    if (!l.counted && below > 0) problems.push(`no count, and lines below: ${all[start + k]}`);
    else if (l.nodes !== l.names + below + l.hidden)
      problems.push(`${l.nodes} != ${l.names} + ${below} + ${l.hidden}: ${all[start + k]}`);
  }
  // The root's count is the header's total (a summary's).
  const total = /^summary: ([0-9,]+) nodes/.exec(all[0] ?? "");
  if (total && !Number.isNaN(lines[0].nodes) && lines[0].nodes !== num(total[1]))
    problems.push(`root ${lines[0].nodes} != header ${total[1]}`);
  if (legend || !key) return problems;
  // A budget with no room for the key beside the root and the focus paths: the header says so.
  const said = /key left out: --budget ([0-9]+)|no key: --budget ([0-9]+)|key left out: |no key\b/.exec(
    head.replaceAll("\n  ", " "),
  );
  if (said) {
    const room = Number(said[1] ?? said[2]);
    noted(Number.isNaN(room) ? undefined : room);
    return problems;
  }
  if (!/(^|; )key: /m.test(head)) {
    problems.push("no key, and nothing says it was left out");
    return problems;
  }
  // Every mark and cut on the lines is explained above them.
  const says = (w) => head.includes(w);
  const need = (cond, word, what) => {
    if (cond && !says(word)) problems.push(`${what} not explained`);
  };
  const marks = new Set(lines.map((l) => l.mark));
  for (const m of marks) need(true, `'${m}'`, `mark '${m}'`);
  // A key in part (no room for all of it beside the root and the focus paths) says every mark and
  // where the rest is.
  if (/(^|; )rest: --legend(;|$)/m.test(head.replaceAll("\n  ", "; "))) {
    partial();
    return problems;
  }
  need(
    lines.some((l) => Number.isNaN(l.nodes)),
    "'?'",
    "'?'",
  );
  need(
    lines.some((l) => Number.isNaN(l.hidden)),
    "(hidden)",
    "a bare '(hidden)'",
  );
  if (lines.some((l) => l.digits) && !/depth|levels? down/.test(head))
    problems.push("a level in digits not explained");
  need(
    lines.some((l) => / \/ \([0-9,]+ more\) \/ /.test(l.label)),
    "more)",
    "'(k more)'",
  );
  need(
    lines.some((l) => l.label.includes("…")),
    "'…'",
    "a cut name '…'",
  );
  need(
    lines.some((l) => l.sizeCut),
    "size cut'",
    "'size cut'",
  );
  need(
    lines.some((l) => l.label.includes(" / ") && !l.label.startsWith("[")),
    "a / b",
    "a chain 'a / b'",
  );
  // The header states a size but no line shows one: the key says the sizes were left out.
  const headSize = kind === "summary" && /^summary: [0-9,]+ nodes, /.test(all[0]);
  if (headSize && lines.every((l) => !l.shownSize) && !/sizes cut|sizes left out/.test(head))
    problems.push("sizes left out, not said");
  return problems;
}

/** Every node of a summary's JSON: nodes = 1 + its children's + hidden. */
export function checkJson(text, budget) {
  const problems = [];
  const doc = JSON.parse(text);
  if (doc.lines > budget) problems.push(`json lines ${doc.lines} > budget ${budget}`);
  const walk = (n) => {
    // A reference (graphs) carries no count: its node is counted at its full entry.
    if (n.reference) {
      if (n.nodes !== 0) problems.push(`json ${n.path}: a reference counts ${n.nodes}`);
      return;
    }
    const below = (n.children ?? []).reduce((s, c) => s + c.nodes, 0);
    const hidden = n.hidden?.nodes ?? 0;
    if (n.nodes !== 1 + below + hidden)
      problems.push(`json ${n.path}: ${n.nodes} != 1 + ${below} + ${hidden}`);
    for (const c of n.children ?? []) walk(c);
  };
  walk(doc.root);
  return problems;
}
