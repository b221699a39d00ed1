/**
 * A strict JSON (RFC 8259) recognizer that runs before the value is built. It finds what a plain
 * parser reports badly or lets through: comments, trailing commas, nesting deeper than
 * MAX_DEPTH, keys that could reach an object's prototype, and numbers too large for a double.
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
      fatal(pos, "", "comments are not allowed in JSON", "remove the comment; put review remarks in the record's `notes` array");
    }
  };
  const unexpected = (ptr: string, expected: string): never => {
    if (pos >= text.length) return fatal(pos, ptr, `the file ends early: expected ${expected}`, "close every open { and [ and finish the last value");
    return fatal(pos, ptr, `unexpected ${show(text[pos] ?? "")}: expected ${expected}`, "fix the JSON syntax at this place");
  };

  function value(ptr: string, depth: number): void {
    ws();
    const c = text[pos];
    if (/^[+-]?(NaN|Infinity)/.test(text.slice(pos, pos + 9))) {
      fatal(pos, ptr, "NaN and Infinity are not numbers in JSON", "write a finite number such as 12");
    }
    if (c === "{" || c === "[") {
      if (depth + 1 > MAX_DEPTH) fatal(pos, ptr, `nesting is deeper than ${MAX_DEPTH} levels`, "flatten the structure; records need only a few levels");
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
    if (text[pos] === "}") { pos++; return; }
    let comma = -1;
    for (;;) {
      ws();
      if (text[pos] === "}") fatal(comma, ptr, "trailing comma before }", "remove the comma after the last member");
      if (text[pos] !== '"') unexpected(ptr, 'a member name in double quotes');
      const keyAt = pos;
      const key = string(ptr);
      const child = `${ptr}/${key.replaceAll("~", "~0").replaceAll("/", "~1")}`;
      if (FORBIDDEN_KEYS.has(key)) {
        report(keyAt, child, `the member name "${key}" is not allowed (it could alter object prototypes)`, "remove or rename this member");
      }
      ws();
      if (text[pos] !== ":") unexpected(child, `":" after the member name`);
      pos++;
      value(child, depth);
      ws();
      if (text[pos] === ",") { comma = pos++; continue; }
      if (text[pos] === "}") { pos++; return; }
      unexpected(child, `"," or "}"`);
    }
  }

  function array(ptr: string, depth: number): void {
    pos++; // [
    ws();
    if (text[pos] === "]") { pos++; return; }
    let comma = -1;
    for (let i = 0; ; i++) {
      ws();
      if (text[pos] === "]") fatal(comma, ptr, "trailing comma before ]", "remove the comma after the last item");
      value(`${ptr}/${i}`, depth);
      ws();
      if (text[pos] === ",") { comma = pos++; continue; }
      if (text[pos] === "]") { pos++; return; }
      unexpected(`${ptr}/${i}`, `"," or "]"`);
    }
  }

  /**
   * Escaped control characters (other than tab, line feed, carriage return) and the non-characters
   * U+FFFE/U+FFFF are valid JSON but cannot be shown: XML 1.0 (§2.2 Char) forbids them in SVG even
   * as character references, and they break HTML parsing and spreadsheet cells. Refuse them here.
   */
  const controlEscape = (at: number, ptr: string, code: number): void =>
    report(at, ptr, `the text holds the control character U+${code.toString(16).toUpperCase().padStart(4, "0")}`, "remove it; only tab and line breaks are allowed in text");

  /** Reads a string token and returns its decoded value. */
  function string(ptr: string): string {
    const start = pos;
    pos++;
    let out = "";
    for (;;) {
      if (pos >= text.length) fatal(start, ptr, "a string is not closed", 'add the closing double quote "');
      const c = text[pos] ?? "";
      if (c === '"') { pos++; return out; }
      if (c.charCodeAt(0) < 0x20) fatal(pos, ptr, "a control character (such as a raw line break or tab) is inside a string", "write it as an escape (\\n, \\t) or remove it");
      if (c === "\\") {
        const e = text[pos + 1] ?? "";
        const simple: Record<string, string> = { '"': '"', "\\": "\\", "/": "/", b: "\b", f: "\f", n: "\n", r: "\r", t: "\t" };
        if (e === "u" && /^[0-9a-fA-F]{4}$/.test(text.slice(pos + 2, pos + 6))) {
          const code = parseInt(text.slice(pos + 2, pos + 6), 16);
          if (unshowable(code)) controlEscape(pos, ptr, code);
          out += String.fromCharCode(code);
          pos += 6;
        } else if (Object.hasOwn(simple, e)) {
          if (e === "b" || e === "f") controlEscape(pos, ptr, e === "b" ? 8 : 12);
          out += simple[e] ?? "";
          pos += 2;
        } else fatal(pos, ptr, `invalid escape ${show("\\" + e)} in a string`, 'use one of \\" \\\\ \\/ \\b \\f \\n \\r \\t \\uXXXX');
      } else { out += c; pos++; }
    }
  }

  function number(ptr: string): void {
    const m = /^-?(0|[1-9][0-9]*)(\.[0-9]+)?([eE][+-]?[0-9]+)?/.exec(text.slice(pos, pos + 400));
    if (!m) return void fatal(pos, ptr, "malformed number", "write a plain decimal number such as 12 or 0.5");
    if (/^[0-9.]/.test(text[pos + m[0].length] ?? "")) fatal(pos, ptr, "malformed number (leading zero or stray digits)", "write a plain decimal number such as 12 or 0.5");
    if (!Number.isFinite(Number(m[0]))) report(pos, ptr, `the number ${m[0]} is too large to represent`, "write a number within the field's range");
    pos += m[0].length;
  }

  try {
    if (text.trim() === "") fatal(0, "", "the file is empty", "write one JSON object, e.g. { \"id\": \"my-design\", ... }");
    value("", 0);
    ws();
    if (pos < text.length) unexpected("", "the end of the file after the top-level value");
  } catch (e) {
    if (!(e instanceof Stop)) throw e;
  }
  return issues;
}

function unshowable(code: number): boolean {
  return (code < 0x20 && code !== 9 && code !== 10 && code !== 13) || (code >= 0x7f && code <= 0x9f) || code === 0xfffe || code === 0xffff;
}

function show(s: string): string {
  return JSON.stringify(s);
}
