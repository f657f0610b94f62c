/**
 * The one YAML loader for every input (wafer.md and run-note front matter,
 * targets.yaml, analysis.yaml, old targets from git): js-yaml 5, with a
 * budget on aliases so an alias bomb ("billion laughs": nine anchors each
 * repeating the one before nine times) is refused in milliseconds instead of
 * being expanded downstream into billions of nodes.
 *
 * js-yaml builds an alias as a shared reference, so loading itself is cheap;
 * the cost comes later, when a validator, a message or `String()` walks the
 * data as a tree. The expanded size is therefore counted on the parser's event
 * stream before anything is built: every node counts one, a collection counts
 * its whole subtree, and an alias counts the full size of the node it repeats.
 *
 * Limits (docs/formats.md, "Limits"), per YAML document:
 * - at most {@link MAX_YAML_ALIASES} aliases (`*name`);
 * - aliases may repeat at most {@link MAX_YAML_ALIAS_NODES} nodes in total.
 * A real record uses a handful of aliases repeating a few nodes each (a shared
 * geometry, a grade's limits), so both are far above honest use.
 *
 * Throws js-yaml's YAMLException (with `mark` and `reason`) for syntax errors
 * and for a broken limit, located at the offending alias.
 */
import { constructFromEvents, EVENT_ID, parseEvents, YAMLException, type Event } from "js-yaml";

export const MAX_YAML_ALIASES = 1000;
export const MAX_YAML_ALIAS_NODES = 100_000;

/** The reason text of a refused alias budget starts with this (for the fix hint). */
export const ALIAS_LIMIT_REASON = "too many nodes repeated through aliases";

/** Loads a single YAML document, refusing alias bombs; same results as js-yaml's `load` otherwise. */
export function loadYaml(text: string): unknown {
  const events = parseEvents(text, {});
  checkAliasExpansion(events, text);
  const documents = constructFromEvents(events, { source: text, maxAliases: MAX_YAML_ALIASES });
  if (documents.length === 0) throw new YAMLException("expected a document, but the input is empty");
  if (documents.length === 1) return documents[0];
  throw new YAMLException("expected a single document in the stream, but found more");
}

/** Counts the nodes each alias repeats (a collection counts its whole subtree) and throws at the alias that passes the budget. */
function checkAliasExpansion(events: readonly Event[], source: string): void {
  let anchors = new Map<string, number>();
  // Per open collection: its node count so far and its anchor name ("" for none).
  const open: { size: number; anchor: string }[] = [];
  let repeated = 0;
  const add = (n: number) => {
    if (open.length) open[open.length - 1].size += n;
  };
  const anchorOf = (e: { anchorStart: number; anchorEnd: number }) => (e.anchorStart === -1 ? "" : source.slice(e.anchorStart, e.anchorEnd));
  for (const e of events) {
    switch (e.type) {
      case EVENT_ID.DOCUMENT:
        anchors = new Map();
        repeated = 0;
        open.length = 0;
        open.push({ size: 0, anchor: "" });
        break;
      case EVENT_ID.SEQUENCE:
      case EVENT_ID.MAPPING:
        open.push({ size: 1, anchor: anchorOf(e) });
        break;
      case EVENT_ID.SCALAR: {
        const name = anchorOf(e);
        if (name) anchors.set(name, 1);
        add(1);
        break;
      }
      case EVENT_ID.ALIAS: {
        // An alias to an unknown or still-open anchor counts one; the constructor reports it.
        const size = anchors.get(source.slice(e.anchorStart, e.anchorEnd)) ?? 1;
        repeated += size;
        if (repeated > MAX_YAML_ALIAS_NODES) {
          YAMLException.throwAt(
            source,
            Math.max(0, e.anchorStart - 1),
            `${ALIAS_LIMIT_REASON} (more than ${MAX_YAML_ALIAS_NODES.toLocaleString("en-US")} after expanding the aliases up to here)`,
          );
        }
        add(size);
        break;
      }
      case EVENT_ID.POP: {
        const done = open.pop();
        if (done && open.length) {
          if (done.anchor) anchors.set(done.anchor, done.size);
          add(done.size);
        }
        break;
      }
    }
  }
}
