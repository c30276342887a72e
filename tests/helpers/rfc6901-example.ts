// Source: RFC 6901 (JSON Pointer), section 5: the example document, and each pointer of the RFC's
// table that names a member with the number it evaluates to (copied from the RFC).

/** The example document of RFC 6901 section 5, as the RFC prints it. */
export const rfc6901Document = `{
      "foo": ["bar", "baz"],
      "": 0,
      "a/b": 1,
      "c%d": 2,
      "e^f": 3,
      "g|h": 4,
      "i\\\\j": 5,
      "k\\"l": 6,
      " ": 7,
      "m~n": 8
   }`;

/** The pointers of the section 5 table that name a member whose value is a number, with that number. */
export const rfc6901MemberPointers: readonly [string, number][] = [
  ["/", 0],
  ["/a~1b", 1],
  ["/c%d", 2],
  ["/e^f", 3],
  ["/g|h", 4],
  ["/i\\j", 5],
  ['/k"l', 6],
  ["/ ", 7],
  ["/m~0n", 8],
];
