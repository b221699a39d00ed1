/**
 * Turns schema-validator errors into our own sentences: what is wrong with the value at this
 * place, and what to write instead. Units are read from the field name's suffix (`_V`, `_A`, ...),
 * the project's naming rule, so messages say "3 V" rather than "3".
 */
import type { ErrorObject } from "ajv";

export interface Wording {
  /** Pointer the message is about (may be deeper than instancePath: a missing or unknown member). */
  pointer: string;
  /** True when the position should be the member's name rather than its value. */
  atKey: boolean;
  message: string;
  remedy: string;
}

const UNITS: [RegExp, string][] = [
  [/_V$/, " V"],
  [/_A$/, " A"],
  [/_Hz$/, " Hz"],
  [/_C$/, " °C"],
  [/_KperW$/, " K/W"],
  [/_W$/, " W"],
  [/_s$/, " s"],
  [/_F$/, " F"],
  [/_ohm$/, " Ω"],
  [/_H$/, " H"],
];

/** The field a pointer names: its last segment that is not an array index. */
export function fieldName(pointer: string): string {
  const parts = pointer
    .split("/")
    .slice(1)
    .filter((s) => !/^\d+$/.test(s));
  return (parts[parts.length - 1] ?? "").replaceAll("~1", "/").replaceAll("~0", "~");
}

export function unitOf(pointer: string): string {
  const f = fieldName(pointer);
  return UNITS.find(([re]) => re.test(f))?.[1] ?? "";
}

/** Keywords that only wrap other errors (the detailed errors are reported instead). */
export const WRAPPER_KEYWORDS = new Set(["if", "then", "else", "propertyNames", "allOf", "anyOf", "oneOf"]);

export function word(e: ErrorObject): Wording {
  if (e.propertyName !== undefined) {
    // Error about a member's name (propertyNames): point at the name itself.
    const { propertyName, ...rest } = e;
    const inner = word({ ...rest, data: propertyName });
    return {
      ...inner,
      pointer: `${e.instancePath}/${esc(propertyName)}`,
      atKey: true,
      message: `member name ${inner.message}`,
    };
  }
  const at = e.instancePath;
  const unit = unitOf(at);
  const ps = (e.parentSchema ?? {}) as Record<string, unknown>;
  const p = e.params as Record<string, unknown>;
  const shown = show(e.data);
  const plain = (message: string, remedy: string): Wording => ({ pointer: at, atKey: false, message, remedy });
  switch (e.keyword) {
    case "type": {
      const want = String(p["type"]);
      if (want === "number" && typeof e.data === "string") {
        return plain(
          `expected a number, found the text ${shown}`,
          "write a plain number without quotes, e.g. 12; NaN and Infinity are not allowed",
        );
      }
      return plain(`expected ${article(want)}, found ${describe(e.data)}`, `write ${article(want)} here`);
    }
    case "minimum":
    case "exclusiveMinimum":
    case "maximum":
    case "exclusiveMaximum": {
      const low = e.keyword.toLowerCase().includes("min");
      const excl = e.keyword.startsWith("exclusive");
      const limit = `${String(p["limit"])}${unit}`;
      const where = low
        ? excl
          ? "must be above"
          : "is below the smallest allowed,"
        : excl
          ? "must be below"
          : "is above the largest allowed,";
      return plain(`${shown}${unit} ${where} ${limit}`, rangeRemedy(at, ps, unit));
    }
    case "enum":
    case "const": {
      const allowed = (e.keyword === "enum" ? (p["allowedValues"] as unknown[]) : [p["allowedValue"]]).map(show);
      return plain(`${shown} is not an allowed value`, `use one of: ${allowed.join(", ")}`);
    }
    case "required": {
      const m = String(p["missingProperty"]);
      return {
        pointer: `${at}/${esc(m)}`,
        atKey: false,
        message: `required member "${m}" is missing`,
        remedy: `add "${m}" here (see docs/writing-a-design.md)`,
      };
    }
    case "additionalProperties": {
      const extra = String(p["additionalProperty"]);
      const known = Object.keys((ps["properties"] as Record<string, unknown> | undefined) ?? {});
      return {
        pointer: `${at}/${esc(extra)}`,
        atKey: true,
        message: `unknown member "${extra}"`,
        remedy: known.length ? `remove it or fix its spelling; allowed here: ${known.join(", ")}` : "remove it",
      };
    }
    case "pattern":
      return plain(`${shown} does not have the required form`, patternRemedy(String(p["pattern"]), ps));
    case "maxItems":
    case "minItems": {
      const n = Array.isArray(e.data) ? e.data.length : 0;
      return e.keyword === "maxItems"
        ? plain(
            `the list has ${n} items, more than the ${String(p["limit"])} allowed`,
            "remove items, or split the design into several records",
          )
        : plain(
            `the list has ${n} items, fewer than the ${String(p["limit"])} needed`,
            `give at least ${String(p["limit"])} item(s)`,
          );
    }
    case "uniqueItems": {
      const i = Number(p["i"]);
      const j = Number(p["j"]);
      const later = Math.max(i, j);
      const v = Array.isArray(e.data) ? show(e.data[later]) : "";
      return {
        pointer: `${at}/${later}`,
        atKey: false,
        message: `${v} repeats item ${Math.min(i, j)} of the list`,
        remedy: "remove the duplicate",
      };
    }
    case "maxLength":
    case "minLength": {
      const n = typeof e.data === "string" ? [...e.data].length : 0;
      return e.keyword === "maxLength"
        ? plain(
            `the text is ${n} characters, more than the ${String(p["limit"])} allowed`,
            "shorten it; longer explanations belong in docs",
          )
        : plain("the text is empty", "write at least a few words");
    }
    case "format":
      return plain(`${shown} is not a valid ${String(p["format"])}`, `write a valid ${String(p["format"])}`);
    default:
      return plain(
        `${shown} breaks the schema rule "${e.keyword}"`,
        typeof ps["description"] === "string"
          ? `expected: ${ps["description"]}`
          : "check the schema in designs/schema/",
      );
  }
}

function rangeRemedy(at: string, ps: Record<string, unknown>, unit: string): string {
  const lo = ps["minimum"] ?? ps["exclusiveMinimum"];
  const hi = ps["maximum"] ?? ps["exclusiveMaximum"];
  const span =
    lo !== undefined && hi !== undefined
      ? `a value from ${String(lo)} to ${String(hi)}${unit}`
      : "a value within the range";
  if (fieldName(at) === "supply_V") return `use ${span}: pulsewright covers low-voltage DC only`;
  return `use ${span}`;
}

function patternRemedy(pattern: string, ps: Record<string, unknown>): string {
  if (pattern === "^[a-z0-9]+(-[a-z0-9]+)*$")
    return "use lower-case letters, digits and single hyphens (kebab-case), e.g. circulation-fan";
  return typeof ps["description"] === "string" ? `expected: ${ps["description"]}` : `match the pattern ${pattern}`;
}

function show(v: unknown): string {
  if (typeof v === "string") return JSON.stringify(v.length > 40 ? `${v.slice(0, 40)}…` : v);
  if (Array.isArray(v)) return "a list";
  if (v !== null && typeof v === "object") return "an object";
  return String(v);
}

function describe(v: unknown): string {
  if (typeof v === "string") return `the text ${show(v)}`;
  if (typeof v === "number") return `the number ${show(v)}`;
  return show(v);
}

function article(type: string): string {
  const names: Record<string, string> = {
    number: "a number",
    integer: "a whole number",
    string: "a text in double quotes",
    array: "a list [ ... ]",
    object: "an object { ... }",
    boolean: "true or false",
  };
  return names[type] ?? type;
}

export function esc(key: string): string {
  return key.replaceAll("~", "~0").replaceAll("/", "~1");
}
