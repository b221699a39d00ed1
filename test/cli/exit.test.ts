/**
 * One error family (src/model/errors.ts), mapped to exit codes in one place (src/cli/exit.ts):
 * usage → 2, record and I/O → 1, anything else → 70 with the stack (EX_SOFTWARE, BSD sysexits.h;
 * common practice for "internal software error").
 */
import { spawnSync } from "node:child_process";
import { parseArgs } from "node:util";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import {
  EngineMisuseError,
  IoError,
  PulsewrightError,
  RecordError,
  SpiceRunError,
  UsageError,
} from "../../src/model/errors.ts";
import { EXIT, failureOf } from "../../src/cli/exit.ts";

const BIN = fileURLToPath(new URL("../../bin/pulsewright.mjs", import.meta.url));

function thrown(fn: () => unknown): unknown {
  try {
    fn();
  } catch (e) {
    return e;
  }
  throw new Error("expected a throw");
}

describe("the error family", () => {
  it("every member is a PulsewrightError with its own name and kind, and keeps `cause`", () => {
    const cause = new Error("EACCES: permission denied");
    const all = [
      new EngineMisuseError("m", { cause }),
      new UsageError("u", { cause }),
      new RecordError("designs/x.json", "/targets/pwm_Hz", "must be positive", { cause }),
      new IoError("write", "_site/", "choose a folder you can write to", { cause }),
      new SpiceRunError("s", { cause }),
    ];
    expect(all.map((e) => [e.name, e.kind])).toEqual([
      ["EngineMisuseError", "misuse"],
      ["UsageError", "usage"],
      ["RecordError", "record"],
      ["IoError", "io"],
      ["SpiceRunError", "simulation"],
    ]);
    for (const e of all) {
      expect(e).toBeInstanceOf(PulsewrightError);
      expect(e).toBeInstanceOf(Error);
      expect(e.cause).toBe(cause);
    }
  });

  it("a record error names the file and the JSON pointer; an I/O error the target, the reason and the remedy", () => {
    const r = new RecordError("designs/x.json", "/targets/pwm_Hz", "must be positive");
    expect(r.message).toBe("designs/x.json: at /targets/pwm_Hz: must be positive");
    expect([r.file, r.pointer, r.detail]).toEqual(["designs/x.json", "/targets/pwm_Hz", "must be positive"]);
    const io = new IoError("write", "out/", "choose a folder you can write to", {
      cause: new Error("EACCES: permission denied"),
    });
    expect(io.message).toBe("cannot write out/: EACCES: permission denied — choose a folder you can write to");
  });
});

describe("exit codes, in one place", () => {
  it("usage → 2, without the usage text; the option parser's own errors → 2, with it", () => {
    expect(failureOf(new UsageError("size: --supply must be a number"))).toEqual({
      code: 2,
      text: "size: --supply must be a number",
      withUsage: false,
    });
    const parse = thrown(() => parseArgs({ args: ["--nope"], options: {}, strict: true }));
    expect(failureOf(parse)).toMatchObject({
      code: EXIT.usage,
      withUsage: true,
      text: expect.stringMatching(/Unknown option '--nope'/),
    });
  });

  it("record and I/O errors → 1, one message and its causes, no stack", () => {
    const rec = failureOf(new RecordError("designs/x.json", "/designs/0/record/id", "appears twice"));
    expect(rec).toEqual({ code: 1, text: "designs/x.json: at /designs/0/record/id: appears twice", withUsage: false });
    const io = failureOf(
      new IoError("listen on", "127.0.0.1:8080", "pick another --port", {
        cause: new Error("outer", { cause: new Error("EADDRINUSE") }),
      }),
    );
    expect(io.code).toBe(1);
    expect(io.text).toBe("cannot listen on 127.0.0.1:8080: outer — pick another --port\n  because: EADDRINUSE");
    expect(io.text).not.toMatch(/^\s+at /m);
  });

  it("engine misuse, an escaped simulation error and anything unexpected → 70, with the stack and the causes", () => {
    for (const err of [
      new EngineMisuseError("assemble: role RT appears twice"),
      new SpiceRunError("no oscillation"),
      new TypeError("x is undefined"),
      "a string",
    ]) {
      const f = failureOf(err);
      expect(f.code).toBe(70);
      expect(f.text).toMatch(/^pulsewright: internal error — please report it/);
      if (err instanceof Error) expect(f.text).toMatch(/^\s+at /m);
    }
    const wrapped = failureOf(
      new EngineMisuseError("sizing failed", { cause: new RangeError("toFixed() digits out of range") }),
    );
    expect(wrapped.text).toMatch(/because: toFixed\(\) digits out of range/);
  });

  it("the command itself exits 2 on a usage error, with one clear message and no stack", () => {
    const r = spawnSync(
      process.execPath,
      [BIN, "size", "--design", "no-such-design", "--supply", "12", "--current", "1", "--chain", "bjt-single"],
      { encoding: "utf8", timeout: 60_000 },
    );
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/no-such-design/);
    expect(r.stderr).not.toMatch(/^\s+at /m);
    expect(r.stderr).not.toMatch(/internal error/);
  });
});
