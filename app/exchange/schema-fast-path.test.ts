import { readFileSync, readdirSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { parseCase } from "./parse";
import { CaseFileSchema, CaseSchema, plainCase } from "./schema";
import { sweepDocument } from "./test-helpers";

// parseCase checks plain cases without zod (plainCase) and the rest of the document with it. The
// fast path may only ever accept what CaseSchema accepts and must give exactly its value, members
// in the same order; anything else goes to zod, which names the field and the rule. These checks
// hold the two together at every bound of every member.

/** The same value, members in the same order (what a serialiser or a hash of the parsed input sees). */
function same(a: unknown, b: unknown) {
  expect(JSON.stringify(a)).toBe(JSON.stringify(b));
  expect(a).toStrictEqual(b);
}

const trimmed = { id: "c", mach: 0.5, altitude: 1000, weight: 50000, nz: 2.5 };
const byAlpha = { id: "c", mach: 0.5, altitude: 1000, alpha: 4 };

// Each member just inside and just outside its rule (the rules of CaseSchema in schema.ts).
const variants: Record<string, unknown>[] = [
  trimmed,
  byAlpha,
  { ...trimmed, id: "" },
  { ...trimmed, id: 7 },
  { ...trimmed, id: "Vₐ ±" },
  { ...trimmed, mach: 0 },
  { ...trimmed, mach: -0 },
  { ...trimmed, mach: -1e-12 },
  { ...trimmed, mach: 0.9999999 },
  { ...trimmed, mach: 1 },
  { ...trimmed, mach: Number.NaN },
  { ...trimmed, mach: "0.5" },
  { ...trimmed, altitude: 0 },
  { ...trimmed, altitude: -1 },
  { ...trimmed, altitude: 32000 },
  { ...trimmed, altitude: 32000.5 },
  { ...trimmed, altitude: Number.POSITIVE_INFINITY },
  { ...byAlpha, alpha: 30 },
  { ...byAlpha, alpha: -30 },
  { ...byAlpha, alpha: 30.0001 },
  { ...byAlpha, alpha: -30.0001 },
  { ...byAlpha, alpha: null },
  { ...trimmed, weight: 0 },
  { ...trimmed, weight: 1e-9 },
  { ...trimmed, weight: 2e7 },
  { ...trimmed, weight: 2.0000001e7 },
  { ...trimmed, nz: 20 },
  { ...trimmed, nz: -20 },
  { ...trimmed, nz: 20.01 },
  { ...trimmed, nz: -20.01 },
  { ...trimmed, massCase: "" },
  { ...trimmed, massCase: 3 },
  { ...trimmed, tailLoad: 2e7 },
  { ...trimmed, tailLoad: -2e7 },
  { ...trimmed, tailLoad: 2.1e7 },
  { ...trimmed, tailLoad: Number.NEGATIVE_INFINITY },
  { ...trimmed, flaps: true },
  { ...trimmed, flaps: false },
  { ...trimmed, flaps: "yes" },
  { ...trimmed, roll: { fraction: 0.75 } },
  { ...trimmed, colour: "red" },
  { ...trimmed, "": 1 },
  { ...trimmed, alpha: undefined },
  { nz: 2.5, weight: 50000, altitude: 1000, mach: 0.5, id: "c" },
  { id: "c", mach: 0.5 },
  {},
];

describe("plainCase: CaseSchema's rules without zod", () => {
  it.each(variants.map((v) => [JSON.stringify(v), v]))("%s: accepted only where CaseSchema accepts it, as the same value", (_, v) => {
    const fast = plainCase(v);
    const zod = CaseSchema.safeParse(v);
    if (fast !== undefined) {
      expect(zod.success).toBe(true);
      same(fast, zod.data);
    }
  });

  it("takes every valid case without roll or undefined members (the common sweep), and leaves the others to zod", () => {
    const valid = variants.filter((v) => CaseSchema.safeParse(v).success);
    const left = valid.filter((v) => plainCase(v) === undefined).map((v) => JSON.stringify(v, (_k, x) => (x === undefined ? "undefined" : x)));
    expect(left).toEqual(['{"id":"c","mach":0.5,"altitude":1000,"weight":50000,"nz":2.5,"roll":{"fraction":0.75}}', '{"id":"c","mach":0.5,"altitude":1000,"weight":50000,"nz":2.5,"alpha":"undefined"}']);
  });

  it("leaves to zod what is not a plain object", () => {
    class Case {
      id = "c";
      mach = 0.5;
      altitude = 0;
      alpha = 1;
    }
    const inherited = Object.assign(Object.create({ extra: 1 }) as object, byAlpha);
    for (const v of [new Case(), inherited, null, [], "c", 1]) expect(plainCase(v)).toBeUndefined();
  });
});

describe("parseCase: the whole document by the fast path equals zod's", () => {
  const dir = join(__dirname, "..", "..", "docs", "examples");
  const docs: [string, unknown][] = [
    ...readdirSync(dir)
      .filter((f) => f.endsWith(".json"))
      .map((f): [string, unknown] => [f, JSON.parse(readFileSync(join(dir, f), "utf8"))]),
    ["a 2 000-case sweep", sweepDocument(2000, 10, 0.02)],
    ["members in another order", { cases: [trimmed], method: { output: "summary" }, wing: sweepDocument(1, 1, 0).wing, schema: "spanwright.case/1" }],
  ];

  it.each(docs)("%s", (_, doc) => {
    const p = parseCase(doc);
    const z = CaseFileSchema.safeParse(doc);
    expect(z.success).toBe(true);
    expect(p.ok).toBe(true);
    if (p.ok) same(p.value, z.data);
  });

  it("still names every problem where the cases are plain but the rules between them are broken", () => {
    const doc = sweepDocument(3, 1, 0);
    doc.cases[2].id = "c0";
    Object.assign(doc.cases[1], { massCase: "cruise" });
    const p = parseCase(doc);
    expect(p.ok ? [] : p.problems).toEqual([
      { path: "cases[1].massCase", message: 'names no mass case of massCases ("cruise")' },
      { path: "cases[2].id", message: 'must be unique ("c0" repeats)' },
    ]);
  });
});
