import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { optionSchema, optionsObjectSchema } from "../../src/cli/option-schema.js";
import { checkValue } from "../../src/cli/option-value.js";
import { allOptions, diffOptionsSchema, summaryOptionsSchema } from "../../src/cli/options.js";
import { issueMessage, validateOptions } from "../../src/cli/validate-options.js";
import type { EspalierError } from "../../src/errors.js";

// The reference is zod (a general-purpose validation library from the registry): each option's value is
// checked by hand on a run (option-value.ts), and by the zod schema made from the same declaration for a
// config file. Both must give the same value, or refuse with the same message.

/** What zod says of one value: the parsed value, or the message validate-options writes for its issue. */
const schemas = new Map(Object.entries(allOptions).map(([key, spec]) => [key, optionSchema(spec)]));

function byZod(key: string, input: unknown): { ok: true; value: unknown } | { ok: false; message: string } {
  const parsed = schemas.get(key)!.safeParse(input);
  if (parsed.success) return { ok: true, value: parsed.data };
  return { ok: false, message: issueMessage(parsed.error.issues[0], `--${key}`, input) };
}

function byHand(key: string, input: unknown): { ok: true; value: unknown } | { ok: false; message: string } {
  const checked = checkValue(allOptions[key].value, input);
  return checked.ok ? checked : { ok: false, message: checked.message(`--${key}`) };
}

/** Values a command line or a YAML config file can give, and near misses of each option's own. */
const anyValue = fc.oneof(
  fc.constantFrom(
    undefined,
    null,
    true,
    false,
    "",
    "0",
    "1",
    "007",
    "12",
    " 12",
    "1e3",
    "0x10",
    "-3",
    "9007199254740991",
    "9007199254740992",
    "99999999999999999999",
    0,
    -0,
    1,
    -1,
    1.5,
    -1.5,
    2 ** 53,
    2 ** 60,
    Number.NaN,
    Number.POSITIVE_INFINITY,
    Number.NEGATIVE_INFINITY,
    [],
    [""],
    ["a"],
    ["a", "b"],
    ["a", "b", "c"],
    ["", "", ""],
    [1, "a"],
    ["a", null],
    {},
    { a: 1 },
    "text",
    "depth",
    "size",
    "json",
    "csv",
    "always",
    "bytes",
    "total",
    "error",
    "skip",
    "Depth",
  ),
  fc.string(),
  fc.integer(),
  fc.double(),
  fc.array(fc.oneof(fc.string(), fc.integer(), fc.constant(null)), { maxLength: 4 }),
  fc.dictionary(fc.string({ maxLength: 3 }), fc.integer(), { maxKeys: 2, noNullPrototype: true }),
);

describe("checkValue(spec, value)", () => {
  it("gives zod's value or zod's message for every option, over random values", () => {
    const keys = Object.keys(allOptions);
    fc.assert(
      fc.property(fc.constantFrom(...keys), anyValue, (key, input) => {
        expect(byHand(key, input)).toEqual(byZod(key, input));
      }),
      { numRuns: 3000 },
    );
  });

  it("gives a list as a new array, so a default is never shared between runs", () => {
    const first = checkValue(allOptions.focus.value, undefined);
    const second = checkValue(allOptions.focus.value, undefined);
    expect(first).toEqual({ ok: true, value: [] });
    expect(first.ok && second.ok && first.value !== second.value).toBe(true);
  });
});

describe("validateOptions(table, values, nameOf)", () => {
  it("gives what zod's object of the same table gives, or the same first refusal", () => {
    const table = summaryOptionsSchema.table;
    const keys = Object.keys(table);
    const schema = optionsObjectSchema(table);
    fc.assert(
      fc.property(
        fc.dictionary(fc.constantFrom(...keys), anyValue, { maxKeys: 4, noNullPrototype: true }),
        (values) => {
          const parsed = schema.safeParse(values);
          let hand: unknown;
          try {
            hand = { ok: true, value: validateOptions(table, values, (key) => ({ name: key })) };
          } catch (err) {
            hand = { ok: false, message: (err as EspalierError).message };
          }
          const zod = parsed.success
            ? { ok: true, value: parsed.data }
            : {
                ok: false,
                message: issueMessage(
                  parsed.error.issues[0],
                  String(parsed.error.issues[0].path[0]),
                  values[String(parsed.error.issues[0].path[0])],
                ),
              };
          expect(hand).toEqual(zod);
        },
      ),
      { numRuns: 1000 },
    );
  });

  it("fills in the defaults and leaves out keys the table does not declare", () => {
    const options = diffOptionsSchema.parse({ budget: "30", printSql: true });
    expect(options.budget).toBe(30);
    expect(options.importance).toBe("depth");
    expect(options.compareField).toEqual([]);
    expect("printSql" in options).toBe(false);
  });

  it("names the option as the caller says and gives USAGE", () => {
    let error: EspalierError | undefined;
    try {
      validateOptions(summaryOptionsSchema.table, { units: "byte" }, () => ({ name: "--units" }));
    } catch (err) {
      error = err as EspalierError;
    }
    expect(error?.code).toBe("USAGE");
    expect(error?.details).toEqual({ option: "--units" });
  });
});
