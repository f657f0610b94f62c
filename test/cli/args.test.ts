// The command-line parser (src/cli/args.ts) and the exit codes of main.ts. No site is built:
// expectations are this program's own documented interface (README "Command line").
import { describe, expect, it, vi } from "vitest";
import { COMMANDS, EXIT, parseArgs } from "../../src/cli/args.ts";

const build = (...a: string[]) => {
  const r = parseArgs(["build", ...a]);
  if (r.command !== "build") throw new Error(`expected a build, got ${JSON.stringify(r)}`);
  return r.options;
};
const usage = (...a: string[]) => {
  const r = parseArgs(a);
  if (r.command !== "usage-error") throw new Error(`expected a usage error, got ${JSON.stringify(r)}`);
  return r.message;
};

describe("waferbook build options", () => {
  it("defaults", () => {
    expect(build()).toEqual({ data: "data", out: "site", strict: false, basePath: "", quiet: false, cache: undefined });
  });
  it("every option, separate and inline values", () => {
    expect(build("--data", "d", "--out=o", "--strict", "--base", "qual", "--quiet", "--cache", "c")).toEqual({
      data: "d",
      out: "o",
      strict: true,
      basePath: "/qual/",
      quiet: true,
      cache: "c",
    });
  });
  it("--cache and --no-cache: the later one wins", () => {
    expect(build("--cache", "c", "--no-cache").cache).toBeNull();
    expect(build("--no-cache", "--cache", "c").cache).toBe("c");
  });
  it("--base is normalised to /path/ and refuses anything but a URL path", () => {
    expect(build("--base", "/a/b").basePath).toBe("/a/b/");
    expect(usage("build", "--base", "../up")).toMatch(/--base must be a URL path/);
    expect(usage("build", "--base", "a b")).toMatch(/--base must be a URL path/);
  });
  it("--out must name a folder", () => {
    expect(usage("build", "--out", "/")).toMatch(/--out must name a folder/);
  });
});

describe("usage errors", () => {
  it("unknown option with the nearest known one", () => {
    expect(usage("build", "--stirct")).toBe('unknown option "--stirct" — did you mean "--strict"?');
    expect(usage("build", "--verison")).toContain('did you mean "--version"?');
    expect(usage("build", "--zzzzzzzzzz")).toBe('unknown option "--zzzzzzzzzz"');
  });
  it("a missing value, including when the next word is another option", () => {
    expect(usage("build", "--data")).toBe("--data needs a value");
    expect(usage("build", "--data", "--out", "x")).toBe("--data needs a value");
  });
  it("a value given to a switch, and a stray word", () => {
    expect(usage("build", "--strict=yes")).toMatch(/--strict takes no value/);
    expect(usage("build", "extra")).toBe('unexpected argument "extra"');
  });
  it("unknown command with a hint, and the help it points to", () => {
    expect(usage("buidl")).toBe('unknown command "buidl" — did you mean "build"?');
    const r = parseArgs(["build", "--nope"]);
    expect(r.command === "usage-error" && r.helpCommand).toBe("waferbook build --help");
  });
});

describe("--help and --version for every command", () => {
  it.each(Object.keys(COMMANDS))("%s --help names every option; %s --version asks for the version", (name) => {
    const h = parseArgs([name, "--data", "x", "--help"]);
    expect(h.command).toBe("help");
    const text = h.command === "help" ? h.text : "";
    for (const opt of Object.keys(COMMANDS[name as keyof typeof COMMANDS].options)) expect(text).toContain(`--${opt}`);
    expect(text).toContain("--version");
    expect(parseArgs([name, "-h"]).command).toBe("help");
    expect(parseArgs([name, "--version"]).command).toBe("version");
    // Help wins over a mistake elsewhere on the line.
    expect(parseArgs([name, "--nonsense", "--help"]).command).toBe("help");
  });
  it("top level: no arguments, --help, help <command>, --version", () => {
    expect(parseArgs([]).command).toBe("help");
    expect(parseArgs(["--help"]).command).toBe("help");
    const hb = parseArgs(["help", "build"]);
    expect(hb.command === "help" && hb.text).toMatch(/^waferbook build — /);
    expect(parseArgs(["--version"]).command).toBe("version");
  });
  it("the help states every exit code", () => {
    const h = parseArgs(["--help"]);
    const text = h.command === "help" ? h.text : "";
    for (const code of Object.values(EXIT)) expect(text).toMatch(new RegExp(`\\b${code} `));
  });
});

describe("exit codes (main.ts)", () => {
  it("0 for help and version, 2 for bad usage", async () => {
    const { main } = await import("../../src/cli/main.ts");
    const write = { out: process.stdout.write, err: process.stderr.write };
    const captured: string[] = [];
    const capture = (text: string) => {
      captured.push(text);
      return true;
    };
    process.stdout.write = capture as typeof process.stdout.write;
    process.stderr.write = capture as typeof process.stderr.write;
    try {
      expect(await main(["build", "--help"])).toBe(0);
      expect(await main(["build", "--version"])).toBe(0);
      expect(await main(["build", "--stirct"])).toBe(2);
    } finally {
      process.stdout.write = write.out;
      process.stderr.write = write.err;
    }
    expect(captured.join("")).toMatch(/^\d+\.\d+\.\d+$/m);
    expect(EXIT).toEqual({ ok: 0, inputErrors: 1, usage: 2, internal: 70 });
  });
});

describe("an internal error", () => {
  it("in a build exits 70 with the stack trace, and says the previous site is untouched", async () => {
    vi.resetModules();
    class Stopped extends Error {}
    vi.doMock("../../src/cli/build.ts", () => ({
      build: async () => {
        throw new TypeError("a bug for the test");
      },
      BuildStoppedError: Stopped,
      BuildLockedError: class extends Stopped {},
    }));
    const { main } = await import("../../src/cli/main.ts");
    const write = process.stderr.write;
    const captured: string[] = [];
    const capture = (text: string) => {
      captured.push(text);
      return true;
    };
    process.stderr.write = capture as typeof process.stderr.write;
    try {
      expect(await main(["build", "--data", "x", "--quiet"])).toBe(70);
    } finally {
      process.stderr.write = write;
      vi.doUnmock("../../src/cli/build.ts");
      vi.resetModules();
    }
    expect(captured.join("")).toMatch(/^waferbook: internal error .*\nTypeError: a bug for the test\n\s+at [\s\S]*\nThe previous site was left as it was\.\n$/);
  });
});
