/**
 * A strict JSON (RFC 8259) recognizer that runs before the value is built. It finds what a plain
 * parser reports badly or lets through: comments, trailing commas, nesting deeper than
 * MAX_DEPTH, keys that could reach an object's prototype, repeated member names, numbers too
 * large for a double, and characters that cannot be shown safely (see `refusal`).
 * It builds nothing, so nothing can be polluted; json-source-map builds the value afterwards.
 */
import { LineIndex } from "./position.ts";
import type { RecordIssue } from "./issue.ts";

export const MAX_DEPTH = 32;
export const FORBIDDEN_KEYS = new Set(["__proto__", "constructor", "prototype"]);

class Stop extends Error {}

export function scanJson(file: string, text: string): RecordIssue[] {
  const issues: RecordIssue[] = [];
  const lines = new LineIndex(text);
  let pos = 0;

  const report = (at: number, pointer: string, message: string, remedy: string): void => {
    const p = lines.at(at);
    issues.push({ file, line: p.line, col: p.col, pointer, message, remedy });
  };
  const fatal = (at: number, pointer: string, message: string, remedy: string): never => {
    report(at, pointer, message, remedy);
    throw new Stop();
  };
  const ws = (): void => {
    while (pos < text.length && " \t\n\r".includes(text[pos] ?? "")) pos++;
    if (text.startsWith("//", pos) || text.startsWith("/*", pos)) {
      fatal(
        pos,
        "",
        "comments are not allowed in JSON",
        "remove the comment; put review remarks in the record's `notes` array",
      );
    }
  };
  const unexpected = (ptr: string, expected: string): never => {
    if (pos >= text.length)
      return fatal(
        pos,
        ptr,
        `the file ends early: expected ${expected}`,
        "close every open { and [ and finish the last value",
      );
    return fatal(
      pos,
      ptr,
      `unexpected ${show(text[pos] ?? "")}: expected ${expected}`,
      "fix the JSON syntax at this place",
    );
  };

  function value(ptr: string, depth: number): void {
    ws();
    const c = text[pos];
    if (/^[+-]?(NaN|Infinity)/.test(text.slice(pos, pos + 9))) {
      fatal(pos, ptr, "NaN and Infinity are not numbers in JSON", "write a finite number such as 12");
    }
    if (c === "{" || c === "[") {
      if (depth + 1 > MAX_DEPTH)
        fatal(
          pos,
          ptr,
          `nesting is deeper than ${MAX_DEPTH} levels`,
          "flatten the structure; records need only a few levels",
        );
      if (c === "{") object(ptr, depth + 1);
      else array(ptr, depth + 1);
    } else if (c === '"') string(ptr);
    else if (c === "-" || (c !== undefined && c >= "0" && c <= "9")) number(ptr);
    else if (text.startsWith("true", pos)) pos += 4;
    else if (text.startsWith("false", pos)) pos += 5;
    else if (text.startsWith("null", pos)) pos += 4;
    else if (c === "'") fatal(pos, ptr, "single quotes are not allowed in JSON", 'use double quotes: "text"');
    else unexpected(ptr, "a value (number, string, true, false, null, object or array)");
  }

  function object(ptr: string, depth: number): void {
    pos++; // {
    ws();
    if (text[pos] === "}") {
      pos++;
      return;
    }
    let comma = -1;
    const seen = new Map<string, number>();
    for (;;) {
      ws();
      if (text[pos] === "}") fatal(comma, ptr, "trailing comma before }", "remove the comma after the last member");
      if (text[pos] !== '"') unexpected(ptr, "a member name in double quotes");
      const keyAt = pos;
      const key = string(ptr);
      const child = `${ptr}/${key.replaceAll("~", "~0").replaceAll("/", "~1")}`;
      if (FORBIDDEN_KEYS.has(key)) {
        report(
          keyAt,
          child,
          `the member name "${key}" is not allowed (it could alter object prototypes)`,
          "remove or rename this member",
        );
      }
      // RFC 8259 §4: names SHOULD be unique; readers differ on which repeat wins, so a reviewer
      // could read one value while the build uses another. Refuse, naming both places.
      const first = seen.get(key);
      if (first !== undefined) {
        report(
          keyAt,
          child,
          `the member "${key}" appears twice in this object (first on line ${lines.at(first).line})`,
          "keep one of them and delete the other",
        );
      } else seen.set(key, keyAt);
      ws();
      if (text[pos] !== ":") unexpected(child, `":" after the member name`);
      pos++;
      value(child, depth);
      ws();
      if (text[pos] === ",") {
        comma = pos++;
        continue;
      }
      if (text[pos] === "}") {
        pos++;
        return;
      }
      unexpected(child, `"," or "}"`);
    }
  }

  function array(ptr: string, depth: number): void {
    pos++; // [
    ws();
    if (text[pos] === "]") {
      pos++;
      return;
    }
    let comma = -1;
    for (let i = 0; ; i++) {
      ws();
      if (text[pos] === "]") fatal(comma, ptr, "trailing comma before ]", "remove the comma after the last item");
      value(`${ptr}/${i}`, depth);
      ws();
      if (text[pos] === ",") {
        comma = pos++;
        continue;
      }
      if (text[pos] === "]") {
        pos++;
        return;
      }
      unexpected(`${ptr}/${i}`, `"," or "]"`);
    }
  }

  /**
   * Escaped control characters (other than tab, line feed, carriage return) and the non-characters
   * U+FFFE/U+FFFF are valid JSON but cannot be shown: XML 1.0 (§2.2 Char) forbids them in SVG even
   * as character references, and they break HTML parsing and spreadsheet cells. Refuse them here.
   */
  const controlEscape = (at: number, ptr: string, code: number): void =>
    report(
      at,
      ptr,
      `the text holds the control character ${uplus(code)}`,
      "remove it; only tab and line breaks are allowed in text",
    );
  /** Refuses a code point that cannot be shown safely, escaped or written directly (see `refusal`). */
  const refuseCodePoint = (at: number, ptr: string, cp: number): void => {
    const why = refusal(cp);
    if (why === "control") controlEscape(at, ptr, cp);
    else if (why === "noncharacter") {
      report(
        at,
        ptr,
        `the text holds the non-character ${uplus(cp)}`,
        "remove it: Unicode non-characters are not for interchange and XML (SVG) forbids U+FFFE and U+FFFF",
      );
    } else if (why === "bidi") {
      report(
        at,
        ptr,
        `the text holds the bidirectional control ${uplus(cp)}, which can make it display in a different order ` +
          `from what it says`,
        "remove it; right-to-left words display correctly without embedding, override or isolate controls",
      );
    }
  };

  /** Reads a string token and returns its decoded value. */
  function string(ptr: string): string {
    const start = pos;
    pos++;
    let out = "";
    for (;;) {
      if (pos >= text.length) fatal(start, ptr, "a string is not closed", 'add the closing double quote "');
      const c = text[pos] ?? "";
      if (c === '"') {
        pos++;
        return out;
      }
      if (c.charCodeAt(0) < 0x20)
        fatal(
          pos,
          ptr,
          "a control character (such as a raw line break or tab) is inside a string",
          "write it as an escape (\\n, \\t) or remove it",
        );
      if (c === "\\") {
        const e = text[pos + 1] ?? "";
        const simple: Record<string, string> = {
          '"': '"',
          "\\": "\\",
          "/": "/",
          b: "\b",
          f: "\f",
          n: "\n",
          r: "\r",
          t: "\t",
        };
        if (e === "u" && /^[0-9a-fA-F]{4}$/.test(text.slice(pos + 2, pos + 6))) {
          const code = parseInt(text.slice(pos + 2, pos + 6), 16);
          const low = /^\\u[dD][c-fC-F][0-9a-fA-F]{2}$/.test(text.slice(pos + 6, pos + 12))
            ? parseInt(text.slice(pos + 8, pos + 12), 16)
            : -1;
          if (code >= 0xd800 && code <= 0xdbff && low >= 0) {
            // An escaped surrogate pair: one supplementary character.
            refuseCodePoint(pos, ptr, 0x10000 + ((code - 0xd800) << 10) + (low - 0xdc00));
            out += String.fromCharCode(code, low);
            pos += 12;
            continue;
          }
          if (code >= 0xd800 && code <= 0xdfff) {
            report(
              pos,
              ptr,
              `the escape \\u${text.slice(pos + 2, pos + 6)} is half of a surrogate pair, alone`,
              "write the whole character, or both halves of its pair",
            );
          } else refuseCodePoint(pos, ptr, code);
          out += String.fromCharCode(code);
          pos += 6;
        } else if (Object.hasOwn(simple, e)) {
          if (e === "b" || e === "f") controlEscape(pos, ptr, e === "b" ? 8 : 12);
          out += simple[e] ?? "";
          pos += 2;
        } else
          fatal(
            pos,
            ptr,
            `invalid escape ${show("\\" + e)} in a string`,
            'use one of \\" \\\\ \\/ \\b \\f \\n \\r \\t \\uXXXX',
          );
      } else {
        // Written directly (not escaped): the same characters are refused.
        const cp = text.codePointAt(pos) ?? 0;
        refuseCodePoint(pos, ptr, cp);
        const n = cp > 0xffff ? 2 : 1;
        out += text.slice(pos, pos + n);
        pos += n;
      }
    }
  }

  function number(ptr: string): void {
    const m = /^-?(0|[1-9][0-9]*)(\.[0-9]+)?([eE][+-]?[0-9]+)?/.exec(text.slice(pos, pos + 400));
    if (!m) return void fatal(pos, ptr, "malformed number", "write a plain decimal number such as 12 or 0.5");
    if (/^[0-9.]/.test(text[pos + m[0].length] ?? ""))
      fatal(
        pos,
        ptr,
        "malformed number (leading zero or stray digits)",
        "write a plain decimal number such as 12 or 0.5",
      );
    if (!Number.isFinite(Number(m[0])))
      report(pos, ptr, `the number ${m[0]} is too large to represent`, "write a number within the field's range");
    pos += m[0].length;
  }

  try {
    if (text.trim() === "") fatal(0, "", "the file is empty", 'write one JSON object, e.g. { "id": "my-design", ... }');
    value("", 0);
    ws();
    if (pos < text.length) unexpected("", "the end of the file after the top-level value");
  } catch (e) {
    if (!(e instanceof Stop)) throw e;
  }
  return issues;
}

/**
 * Why a code point is refused in record text, or null when it may stay:
 * - control: C0 controls but tab, line feed and carriage return; DEL and the C1 controls
 *   U+0080–U+009F (The Unicode Standard, §23.1) — XML 1.0 §2.2 discourages or forbids them, and
 *   they break HTML parsing and spreadsheet cells;
 * - noncharacter: U+FDD0–U+FDEF and the last two code points of every plane (The Unicode
 *   Standard, §23.7); XML 1.0 §2.2 Char excludes U+FFFE and U+FFFF, so an SVG holding them is
 *   not well-formed;
 * - bidi: the embedding, override and isolate controls U+202A–U+202E and U+2066–U+2069
 *   (Unicode Standard Annex #9), which can reorder what a reviewer sees (Unicode Technical
 *   Standard #39 and the "Trojan Source" class of attacks).
 */
export function refusal(cp: number): "control" | "noncharacter" | "bidi" | null {
  if ((cp < 0x20 && cp !== 9 && cp !== 10 && cp !== 13) || (cp >= 0x7f && cp <= 0x9f)) return "control";
  if ((cp >= 0xfdd0 && cp <= 0xfdef) || (cp & 0xfffe) === 0xfffe) return "noncharacter";
  if ((cp >= 0x202a && cp <= 0x202e) || (cp >= 0x2066 && cp <= 0x2069)) return "bidi";
  return null;
}

function uplus(cp: number): string {
  return `U+${cp.toString(16).toUpperCase().padStart(4, "0")}`;
}

function show(s: string): string {
  return JSON.stringify(s);
}
