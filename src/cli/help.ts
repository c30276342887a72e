/** Worked examples shown after --help, set in the fictional company and monorepo of the demo data. */
export const SUMMARY_EXAMPLES = `
Examples:
  # The people around one engineer in a 3,000-person org chart, in 30 lines
  espalier fixtures/quillfeather-org.csv --parent-field manager --size-field cost \\
      --focus Q2417 --label '{name}, {title}' --budget 30

  # Two teams at once, names replaced by the team and title of each person
  espalier fixtures/quillfeather-org.csv --parent-field manager --label '{title} ({team})' \\
      --focus Q2417 --focus Q0627

  # Where the bytes are in a monorepo listing (find DIR -printf '%s\\t%p\\n' > files.paths)
  find . -printf '%s\\t%p\\n' | espalier - --importance size --budget 25

  # Every test folder of one service, as JSON for a script
  espalier fixtures/tidewater-files.paths --focus './services/ledger/**/test' --format json

  # Foci from a file, one path, id or glob per line
  espalier fixtures/tidewater-deps.json --focus-from changed-packages.txt

Paths: names from below the root joined by "/", with "~" written "~0" and "/" written "~1"
(RFC 6901). "*" matches within a name, "**" any number of levels. Every path espalier prints
is accepted back as a focus.

Exit status: 0 success, 2 usage or input error (one line on standard error, nothing on standard
output).
`;
