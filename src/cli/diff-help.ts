/** Worked examples shown after `espalier diff --help`, set in the fictional company and monorepo. */
export const DIFF_EXAMPLES = `
Examples:
  # What changed in the org chart since last week, in 30 lines
  espalier diff org-last-week.csv fixtures/quillfeather-org.csv --parent-field manager --budget 30

  # Dependency tree before and after a pull request, failing the CI step when it changed
  espalier diff deps-main.json deps-branch.json --exit-code --budget 40

  # The new version from standard input, as JSON for a script
  generate-deps | espalier diff fixtures/tidewater-deps.json - --format json

Changes: [added], [removed], [moved from OLD/PARENT], [renamed from OLD], [resized +12 B].
Nodes are matched by row id when both versions have ids, otherwise by path; matched by path, a
moved or renamed node shows as one removed and one added.

Exit status: 0 success (with --exit-code: 0 no differences, 1 differences), 2 usage or input error.
`;
