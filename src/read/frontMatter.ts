/**
 * Front matter + Markdown body, read with gray-matter and js-yaml 5 (gray-matter's
 * bundled YAML parser is old, so its engine is replaced). YAML syntax errors
 * become located problems with line and column in the file.
 */
import matter from "gray-matter";
import { InputError } from "../model/problem.ts";
import { ALIAS_LIMIT_REASON, loadYaml, MAX_YAML_ALIASES, MAX_YAML_ALIAS_NODES } from "./yamlLoad.ts";
import { fieldOffsets, offsetOfPath, type FieldOffsets } from "./yamlPositions.ts";

export interface FrontMatterDoc {
  data: unknown;
  body: string;
  /** 1-based line in the file where the front-matter text starts (after `---`). */
  firstLine: number;
  /** The raw front-matter text, for locating fields. */
  matterText: string;
}

export function readFrontMatter(text: string, file: string): FrontMatterDoc {
  if (!/^---\r?\n/.test(text)) {
    throw new InputError({
      file,
      line: 1,
      message: "no front matter",
      expected: 'the file to start with a line "---", the YAML fields, and another "---"',
      found: JSON.stringify(text.split(/\r?\n/)[0].slice(0, 30)),
      fix: "add the front matter block; see docs/formats.md",
    });
  }
  const closing = /\r?\n---[ \t]*(\r?\n|$)/.exec(text.slice(3));
  if (!closing) {
    throw new InputError({
      file,
      line: 1,
      message: "front matter is not closed",
      expected: 'a second line "---" after the YAML fields',
      found: "the end of the file",
      fix: 'add the closing "---" line',
    });
  }
  let parsed: matter.GrayMatterFile<string>;
  try {
    parsed = matter(text, { engines: { yaml: (s: string) => loadYaml(s) as object } });
  } catch (err) {
    const e = err as { mark?: { line: number; column: number }; reason?: string; message: string };
    if (e.mark) {
      // The front-matter text starts right after the opening "---", so YAML's line 0 is file line 1.
      const line = e.mark.line + 1;
      throw new InputError({
        file,
        line,
        column: e.mark.column + 1,
        message: `YAML syntax error: ${e.reason ?? "cannot parse"}`,
        expected: 'valid YAML (spaces for indentation, "key: value")',
        found: lineText(text, line),
        fix: /tab/i.test(e.reason ?? "") ? "indent with spaces, not tabs" : "check the indentation and quoting on that line",
        ...aliasLimit(e.reason),
      });
    }
    // No position from the parser: locate at the opening "---" of the block it could not read.
    throw new InputError({
      file,
      line: 1,
      message: `cannot read front matter: ${e.message.split("\n")[0]}`,
      expected: 'YAML "key: value" lines between the two "---" lines',
      found: "text the YAML reader refused",
      fix: "check the indentation and quoting of the front matter; see docs/formats.md",
    });
  }
  return { data: parsed.data, body: parsed.content, firstLine: 2, matterText: parsed.matter };
}

/** Reads a plain YAML file (targets.yaml, analysis.yaml) with located syntax errors. */
export function readYaml(text: string, file: string): unknown {
  try {
    return loadYaml(text);
  } catch (err) {
    const e = err as { mark?: { line: number; column: number }; reason?: string; message: string };
    // Without a position from the parser, point at the top of the file.
    const line = e.mark ? e.mark.line + 1 : 1;
    throw new InputError({
      file,
      line,
      column: e.mark ? e.mark.column + 1 : undefined,
      message: `YAML syntax error: ${e.reason ?? e.message}`,
      expected: "valid YAML",
      found: e.mark ? lineText(text, line) : "text YAML cannot read",
      fix: e.mark ? "check the indentation and quoting on that line" : "check the indentation and quoting in the file",
      ...aliasLimit(e.reason),
    });
  }
}

/** Message, expected and fix for a refused alias budget (loadYaml's own limit or js-yaml's maxAliases); nothing for other errors. */
function aliasLimit(reason: string | undefined): { message: string; expected: string; fix: string } | Record<string, never> {
  if (!reason || !(reason.startsWith(ALIAS_LIMIT_REASON) || reason.includes("maxAliases"))) return {};
  const limits = `at most ${MAX_YAML_ALIASES} aliases, repeating at most ${MAX_YAML_ALIAS_NODES.toLocaleString("en-US")} nodes in all`;
  return {
    message: `YAML alias limit: ${reason}`,
    expected: limits,
    fix: "write the values out instead of repeating them through aliases (docs/formats.md, Limits)",
  };
}

/** The text of a 1-based line, shortened and quoted, for "found" in a YAML syntax message. */
function lineText(text: string, line: number): string {
  const lines = text.split(/\r?\n/);
  if (line > lines.length || (line === lines.length && lines[line - 1] === "")) return "the end of the text";
  const t = lines[line - 1];
  return JSON.stringify(t.length > 40 ? `${t.slice(0, 37)}…` : t);
}

/**
 * The 1-based file line of a field (dotted path, "[i]" for items) in YAML text,
 * from the parser's own source positions (yamlPositions.ts): the line of the
 * field's key, or of its nearest present ancestor when the field itself is
 * absent; undefined when the text does not parse or not even the first part is
 * there. `firstLine` is the file line of matterText's first line (or of the
 * line after it when matterText starts with the newline after "---", as
 * gray-matter's does).
 */
export function lineOfField(matterText: string, fieldPath: string, firstLine: number): number | undefined {
  if (cached?.text !== matterText) cached = { text: matterText, offsets: fieldOffsets(matterText) };
  const offsets = cached.offsets;
  const at = offsets && offsetOfPath(offsets, fieldPath);
  if (at === undefined) return undefined;
  let line = 0;
  for (let i = matterText.indexOf("\n"); i !== -1 && i < at; i = matterText.indexOf("\n", i + 1)) line++;
  const offset = matterText.startsWith("\n") || matterText.startsWith("\r\n") ? firstLine - 1 : firstLine;
  return line + offset;
}

/** The last text located and its field offsets (validators ask for many fields of one record in a row). */
let cached: { text: string; offsets: FieldOffsets | undefined } | undefined;
