import fc from "fast-check";
import { z } from "zod";
import { BALANCE_GRADES, LAYOUT_PRESETS } from "@/lib/balance";

// Request bodies for fuzzing the JSON APIs: values a careless or hostile client might send, bodies
// shaped like the route's own schema with one part of them made hostile, and text that is not
// JSON at all. Every body is the exact text sent, so number literals JSON.stringify cannot write
// (1e999, 9007199254740993, -0) reach the server as typed.

/** What was sent, printed short when fast-check reports a counterexample. */
export interface Body {
  kind: string;
  text: string;
}

function body(kind: string, text: string): Body {
  return {
    kind,
    text,
    [fc.toStringMethod]: () =>
      `${kind} (${text.length} chars): ${text.length > 240 ? `${text.slice(0, 240)}…` : text}`,
  } as Body;
}

const LONG = "x".repeat(100_000);
const LONG_UNICODE = "⚙️ Kurbelwelle وزن 🛠️ ".repeat(5_000);

/** Depth-200 nesting, as arrays and as objects. */
export const DEEP_ARRAY_TEXT = `${"[".repeat(200)}1${"]".repeat(200)}`;
export const DEEP_OBJECT_TEXT = `${'{"a":'.repeat(200)}1${"}".repeat(200)}`;
const deepArray = (): unknown => JSON.parse(DEEP_ARRAY_TEXT);
const deepObject = (): unknown => JSON.parse(DEEP_OBJECT_TEXT);

/** Values that are valid JSON but wrong almost anywhere. */
export const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom<unknown>(
    1e308,
    -1e308,
    2 ** 53 + 1,
    -(2 ** 53 + 1),
    Number.MAX_SAFE_INTEGER,
    Number.MIN_VALUE,
    -1,
    0,
    0.5,
    1.5,
    "NaN",
    "-0",
    "Infinity",
    "-Infinity",
    "1e3",
    "1e-7",
    " 1 ",
    "+5",
    ".5",
    "5.",
    "1,5",
    "12.3.4",
    "0x1F",
    "1_000",
    "٣٤٫٥",
    "１２",
    "999999999.999999999",
    "0000000000000000001",
    "-12.5",
    "",
    " ",
    "\u0000",
    "abc\u0000def",
    "🛠️⚙️🔩",
    "\u202Egnp.exe",
    "مرحبا بالعالم",
    "null",
    "undefined",
    "true",
    "<img src=x onerror=alert(1)>",
    "'; drop table jobs; --",
    "../../etc/passwd",
    "%00",
    LONG,
    LONG_UNICODE,
    true,
    false,
    null,
    [],
    {},
    [1, "2", null],
    JSON.parse('{"__proto__":{"admin":true},"constructor":{"prototype":{"admin":true}}}'),
  ),
  fc.constant(null).map(deepArray),
  fc.constant(null).map(deepObject),
  fc.double(),
  fc.integer(),
  fc.string({ unit: "grapheme", maxLength: 30 }),
  fc.jsonValue({ maxDepth: 2 }),
);

/** A number literal JSON.stringify cannot produce, put in the text where a value goes. */
const rawNumberLiteral = fc.constantFrom(
  "1e999",
  "-1e999",
  "9007199254740993",
  "-0",
  "1e-400",
  "123456789012345678901234567890",
);

type JsonSchema = {
  type?: string | string[];
  properties?: Record<string, JsonSchema>;
  required?: string[];
  additionalProperties?: boolean | JsonSchema;
  items?: JsonSchema;
  prefixItems?: JsonSchema[];
  minItems?: number;
  maxItems?: number;
  anyOf?: JsonSchema[];
  oneOf?: JsonSchema[];
  allOf?: JsonSchema[];
  enum?: unknown[];
  const?: unknown;
  pattern?: string;
  format?: string;
  minLength?: number;
  maxLength?: number;
  minimum?: number;
  maximum?: number;
  exclusiveMinimum?: number;
  exclusiveMaximum?: number;
  $ref?: string;
  $defs?: Record<string, JsonSchema>;
};

/** The schema a client sees (its input side), with anything JSON Schema cannot say left open. */
export function jsonSchemaOf(schema: z.ZodType): JsonSchema {
  return z.toJSONSchema(schema, { io: "input", unrepresentable: "any" }) as JsonSchema;
}

function stringFor(s: JsonSchema): fc.Arbitrary<string> {
  const maxLength = Math.min(s.maxLength ?? 40, 40);
  const minLength = Math.min(s.minLength ?? 0, maxLength);
  if (s.pattern) {
    return fc
      .stringMatching(new RegExp(s.pattern))
      .filter((v) => v.length <= (s.maxLength ?? Infinity) && v.length >= (s.minLength ?? 0));
  }
  if (s.format === "email") return fc.emailAddress();
  if (s.format === "date") {
    return fc
      .date({ min: new Date("2000-01-01"), max: new Date("2099-12-31"), noInvalidDate: true })
      .map((d) => d.toISOString().slice(0, 10));
  }
  return fc.string({ minLength, maxLength });
}

function numberFor(s: JsonSchema, integer: boolean): fc.Arbitrary<number> {
  const min = s.minimum ?? (s.exclusiveMinimum !== undefined ? s.exclusiveMinimum + 1 : -1000);
  const max = s.maximum ?? (s.exclusiveMaximum !== undefined ? s.exclusiveMaximum - 1 : 1_000_000);
  if (!integer) return fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
  // Small values are ids and versions that exist; the whole range finds the edges.
  const lo = Math.max(min, -1_000_000_000);
  const hi = Math.min(max, 1_000_000_000);
  const small = fc.integer({ min: Math.max(lo, Math.min(0, hi)), max: Math.min(hi, lo + 12) });
  return fc.oneof({ arbitrary: small, weight: 3 }, fc.integer({ min: lo, max: hi }));
}

const csvCell = fc.oneof(
  fc.constantFrom("1", "2", "8", "16", "17", "0", "-1", "512.4", "0.0", "999999999.999999999"),
  fc.constantFrom("piston", "wristPin", "Wrist pin", "big end", "rodTotal", "initial", "final"),
  fc.constantFrom('"', '""', "a,b", "=1+1", "\u0000", "🛠️", " ", "", "x".repeat(500)),
  fc.string({ maxLength: 8 }),
);

/** A weigh-in CSV, in the long layout or the one-column-per-part layout, with odd cells. */
const weighInCsv = fc
  .tuple(
    fc.constantFrom(
      ["cylinder", "part", "phase", "weight"],
      ["cylinder", "piston", "wristPin", "smallEnd", "bigEnd"],
      ["Cylinder", "Part", "Weight"],
      ["cylinder"],
      ["piston", "piston"],
    ),
    fc.array(fc.array(csvCell, { maxLength: 6 }), { maxLength: 12 }),
    fc.constantFrom("\n", "\r\n", "\r"),
  )
  .map(([head, rows, eol]) => [head, ...rows].map((r) => r.join(",")).join(eol));

/**
 * Fields whose schema says only "a string" to JSON Schema (an e-mail checked after trimming, a
 * grade matched after its "G" is taken off, a layout named by its preset id, a password that must match its confirmation): values
 * that get past those checks, so the bodies reach the code behind them.
 */
const FIELD_HINTS: Record<string, fc.Arbitrary<string>> = {
  email: fc.emailAddress(),
  to: fc.emailAddress(),
  preset: fc.constantFrom(...LAYOUT_PRESETS.map((p) => p.id)),
  grade: fc.constantFrom(...BALANCE_GRADES.map((g) => `G ${g}`), ...BALANCE_GRADES),
  csv: weighInCsv,
  password: fc.constant("a long enough password"),
  confirm: fc.constant("a long enough password"),
};

/** Bodies that fit the schema's shape (most of them valid, some not: refinements are unseen). */
export function shapedBy(root: JsonSchema): fc.Arbitrary<unknown> {
  const walk = (s: JsonSchema, depth: number): fc.Arbitrary<unknown> => {
    if (depth > 8) return fc.constant(null);
    if (s.$ref) {
      const name = s.$ref.replace(/^#\/\$defs\//, "");
      const target = root.$defs?.[name];
      return target ? walk(target, depth + 1) : fc.jsonValue({ maxDepth: 1 });
    }
    if (s.const !== undefined) return fc.constant(s.const);
    if (s.enum) return fc.constantFrom(...s.enum);
    const choices = s.anyOf ?? s.oneOf;
    if (choices) return fc.oneof(...choices.map((c) => walk(c, depth + 1)));
    if (s.allOf?.[0]) return walk(s.allOf[0], depth + 1);
    const types = Array.isArray(s.type) ? s.type : s.type ? [s.type] : [];
    if (types.length > 1) return fc.oneof(...types.map((t) => walk({ ...s, type: t }, depth + 1)));
    switch (types[0]) {
      case "string":
        return stringFor(s);
      case "integer":
        return numberFor(s, true);
      case "number":
        return numberFor(s, false);
      case "boolean":
        return fc.boolean();
      case "null":
        return fc.constant(null);
      case "array":
        return fc.array(s.items ? walk(s.items, depth + 1) : fc.jsonValue({ maxDepth: 1 }), {
          minLength: s.minItems ?? 0,
          maxLength: Math.max(Math.min(s.maxItems ?? 4, 4), s.minItems ?? 0),
        });
      case "object": {
        const props = s.properties ?? {};
        const model = Object.fromEntries(
          Object.entries(props).map(([k, v]) => {
            const hint = FIELD_HINTS[k];
            const plain = walk(v, depth + 1);
            return [k, hint && v.type === "string" && !v.pattern ? fc.oneof(hint, plain) : plain];
          }),
        );
        return fc.record(model, { requiredKeys: (s.required ?? []).filter((k) => k in props) });
      }
      default:
        return fc.jsonValue({ maxDepth: 2 });
    }
  };
  return walk(root, 0);
}

/** Every place in a value where another value could go: [] is the value itself. */
function pathsIn(value: unknown, prefix: (string | number)[] = []): (string | number)[][] {
  const here = [prefix];
  if (Array.isArray(value)) return here.concat(value.flatMap((v, i) => pathsIn(v, [...prefix, i])));
  if (value && typeof value === "object")
    return here.concat(Object.entries(value).flatMap(([k, v]) => pathsIn(v, [...prefix, k])));
  return here;
}

function replaceAt(value: unknown, path: (string | number)[], next: unknown): unknown {
  if (path.length === 0) return next;
  const [head, ...rest] = path as [string | number, ...(string | number)[]];
  if (Array.isArray(value)) {
    const copy = [...value];
    copy[head as number] = replaceAt(copy[head as number], rest, next);
    return copy;
  }
  const copy = { ...(value as Record<string, unknown>) };
  copy[head as string] = replaceAt(copy[head as string], rest, next);
  return copy;
}

function removeAt(value: unknown, path: (string | number)[]): unknown {
  if (path.length === 0 || !value || typeof value !== "object") return value;
  const [head, ...rest] = path as [string | number, ...(string | number)[]];
  if (rest.length === 0) {
    if (Array.isArray(value)) return value.filter((_, i) => i !== head);
    const { [head as string]: _gone, ...kept } = value as Record<string, unknown>;
    return kept;
  }
  return replaceAt(value, [head], removeAt((value as Record<string, unknown>)[head], rest));
}

const EXTRA_KEYS = ["__proto__", "constructor", "role", "id", "customerId", "version", "isAdmin"];

/** JSON text with an own `key` property added at the top (even `__proto__`). */
function withExtraKey(value: unknown, key: string, extra: unknown): string {
  const text = JSON.stringify(value) ?? "null";
  if (!value || typeof value !== "object" || Array.isArray(value)) return text;
  const member = `${JSON.stringify(key)}:${JSON.stringify(extra) ?? "null"}`;
  return text === "{}" ? `{${member}}` : `{${member},${text.slice(1)}`;
}

/** The text with its first number (or, failing that, its first string) replaced by a literal. */
function withLiteral(text: string, literal: string): string {
  if (/-?\d+(\.\d+)?([eE][+-]?\d+)?/.test(text))
    return text.replace(/(?<=[:[,])\s*-?\d+(\.\d+)?([eE][+-]?\d+)?/, literal);
  return text.replace(/"(?:[^"\\]|\\.)*"(?=\s*[,}\]])/, literal);
}

const notJson = fc.oneof(
  fc.constantFrom(
    "",
    "{",
    "}",
    "[",
    '{"a":',
    "{'single': 'quotes'}",
    "{a: 1}",
    "nope",
    "undefined",
    "NaN",
    "\u0000",
    "\uFEFF{}",
    "{}garbage",
    "[1,2,]",
    '{"a":1,}',
    "<xml/>",
    "a=1&b=2",
  ),
  fc.string({ unit: "binary", maxLength: 60 }),
);

/**
 * Hostile bodies for a route: with its schema, mostly near-valid bodies with one thing wrong
 * (a field hostile, a field missing, an extra field, a raw number literal, cut short); without,
 * just hostile values. Always some text that is not JSON and some plain hostile JSON.
 */
export function hostileBodies(schema: JsonSchema | undefined): fc.Arbitrary<Body> {
  const plain = fc.oneof(
    hostileValue.map((v) => body("hostile value", JSON.stringify(v) ?? "null")),
    notJson.map((t) => body("not JSON", t)),
    fc.constantFrom(
      body("deep array", DEEP_ARRAY_TEXT),
      body("deep object", DEEP_OBJECT_TEXT),
      body("null", "null"),
      body("array for object", "[{}]"),
    ),
  );
  if (!schema) return plain;
  const shaped = shapedBy(schema);
  const pick = fc.nat();
  return fc.oneof(
    { arbitrary: shaped.map((v) => body("shaped", JSON.stringify(v) ?? "null")), weight: 2 },
    {
      arbitrary: fc.tuple(shaped, pick, hostileValue).map(([v, i, h]) => {
        const paths = pathsIn(v);
        return body(
          "one field hostile",
          JSON.stringify(replaceAt(v, paths[i % paths.length]!, h)) ?? "null",
        );
      }),
      weight: 4,
    },
    {
      arbitrary: fc.tuple(shaped, pick).map(([v, i]) => {
        const paths = pathsIn(v).filter((p) => p.length > 0);
        const gone = paths.length ? removeAt(v, paths[i % paths.length]!) : v;
        return body("one field missing", JSON.stringify(gone) ?? "null");
      }),
      weight: 1,
    },
    {
      arbitrary: fc
        .tuple(shaped, fc.oneof(fc.constantFrom(...EXTRA_KEYS), fc.string()), hostileValue)
        .map(([v, k, h]) => body("extra field", withExtraKey(v, k, h))),
      weight: 1,
    },
    {
      arbitrary: fc
        .tuple(shaped, rawNumberLiteral)
        .map(([v, lit]) => body("raw number literal", withLiteral(JSON.stringify(v) ?? "", lit))),
      weight: 1,
    },
    {
      arbitrary: fc.tuple(shaped, pick).map(([v, i]) => {
        const text = JSON.stringify(v) ?? "";
        return body("cut short", text.slice(0, text.length ? i % text.length : 0));
      }),
      weight: 1,
    },
    { arbitrary: shaped.map((v) => body("wrapped in an array", JSON.stringify([v]))), weight: 1 },
    { arbitrary: plain, weight: 3 },
  );
}
