/**
 * Exact source positions of the fields of a YAML text, from js-yaml 5's own
 * event stream (parseEvents: every scalar, mapping and sequence carries its
 * zero-based source offset). Used to give located problems the line of the key
 * they are about, in block and flow style alike, with anchors, quoted keys and
 * comments — no indentation guessing.
 *
 * Paths are written as the validators name fields: keys joined by ".", sequence
 * items as "[i]" (or ".i"), e.g. `devices[0].geometry.width_um`.
 */
import { EVENT_ID, getScalarValue, parseEvents, type Event } from "js-yaml";

/** Canonical path → zero-based offset of the key (mapping entry) or item (sequence entry). */
export type FieldOffsets = Map<string, number>;

/** The offsets of every field of the first document; undefined when the text does not parse. */
export function fieldOffsets(text: string): FieldOffsets | undefined {
  let events: readonly Event[];
  try {
    events = parseEvents(text, {});
  } catch {
    return undefined;
  }
  const out: FieldOffsets = new Map();
  // Per open collection: its path, whether a mapping, the item count or the pending key.
  const stack: { path: string; mapping: boolean; index: number; key: string | null }[] = [];
  let documents = 0;
  /** Path and offset of the node that starts here, as a child of the innermost collection (null: a mapping key). */
  const place = (offset: number, keyText: () => string): string | null => {
    const top = stack[stack.length - 1];
    if (!top) return "";
    if (top.mapping) {
      if (top.key === null) {
        top.key = keyText();
        const path = top.path ? `${top.path}.${top.key}` : top.key;
        if (!out.has(path)) out.set(path, offset);
        return null;
      }
      const path = top.path ? `${top.path}.${top.key}` : top.key;
      top.key = null;
      return path;
    }
    const path = `${top.path}[${top.index++}]`;
    if (!out.has(path)) out.set(path, offset);
    return path;
  };
  for (const e of events) {
    switch (e.type) {
      case EVENT_ID.DOCUMENT:
        if (++documents > 1) return out;
        break;
      case EVENT_ID.MAPPING:
      case EVENT_ID.SEQUENCE: {
        const path = place(e.start, () => "");
        stack.push({ path: path ?? "", mapping: e.type === EVENT_ID.MAPPING, index: 0, key: null });
        break;
      }
      case EVENT_ID.SCALAR:
        place(e.valueStart, () => getScalarValue(text, e));
        break;
      case EVENT_ID.ALIAS:
        place(e.anchorStart, () => text.slice(e.anchorStart, e.anchorEnd));
        break;
      case EVENT_ID.POP:
        stack.pop();
        break;
    }
  }
  return out;
}

/** Splits "a.b[0].c" or "a.b.0.c" into its parts. */
export function pathParts(fieldPath: string): string[] {
  return fieldPath.split(/\.|\[(\d+)\]/).filter((p) => p !== undefined && p !== "");
}

/**
 * Offset of the deepest part of `fieldPath` present in the text (the field
 * itself when it exists, else its nearest present ancestor); undefined when not
 * even the first part is there. A numeric part matches a sequence index or a
 * mapping key of that name.
 */
export function offsetOfPath(offsets: FieldOffsets, fieldPath: string): number | undefined {
  let path = "";
  let found: number | undefined;
  for (const part of pathParts(fieldPath)) {
    const candidates = /^\d+$/.test(part) ? [`${path}[${part}]`, path ? `${path}.${part}` : part] : [path ? `${path}.${part}` : part];
    const hit = candidates.find((c) => offsets.has(c));
    if (hit === undefined) break;
    path = hit;
    found = offsets.get(hit);
  }
  return found;
}
