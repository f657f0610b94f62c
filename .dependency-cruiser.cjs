/**
 * The one-way rule of DEVELOPERS.md ("The pipeline is the layout"), checked by dependency-cruiser
 * in `npm test`: each folder of src/ may import only folders below it, never one above.
 *
 *   physics → model → read → validate → analyse | synth → judge → publish → cli
 *
 * analyse and synth stand side by side and import neither each other nor anything above them:
 * the synthetic generators must not borrow the analysis they are used to check.
 * Type-only imports count too (parser "swc" sees them).
 */

/** Layers from the bottom up; a layer may import only the layers before it (and itself). */
const LAYERS = [["physics"], ["model"], ["read"], ["validate"], ["analyse", "synth"], ["judge"], ["publish"], ["cli"]];

/**
 * Known upward imports of src/synth, allowed for now and listed exactly (importing file → imported
 * file) so that no new one slips in. Remove each pair when the generator writes its formula out
 * from the published form (issue 17, the synth half); then remove this list.
 */
const KNOWN_SYNTH_UPWARD = [];

const escapeRegExp = (s) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
const folders = (names) => `^src/(${names.join("|")})/`;

function layerRules() {
  const rules = [];
  LAYERS.forEach((layer, i) => {
    const above = LAYERS.slice(i + 1).flat();
    for (const name of layer) {
      const siblings = layer.filter((other) => other !== name);
      const forbidden = [...siblings, ...above];
      if (forbidden.length === 0) continue;
      const excepted = KNOWN_SYNTH_UPWARD.filter(([from]) => from.startsWith(`src/${name}/`));
      const exceptedFiles = [...new Set(excepted.map(([from]) => from))];
      rules.push({
        name: `layer-${name}`,
        comment: `src/${name} may not import ${forbidden.map((f) => `src/${f}`).join(", ")} (one-way layers, DEVELOPERS.md)`,
        severity: "error",
        from: { path: `^src/${name}/`, pathNot: exceptedFiles.map((f) => `^${escapeRegExp(f)}$`) },
        to: { path: folders(forbidden) },
      });
      for (const file of exceptedFiles) {
        const allowed = excepted.filter(([from]) => from === file).map(([, to]) => `^${escapeRegExp(to)}$`);
        rules.push({
          name: `layer-${name}-known-exception`,
          comment: `${file} may import only its listed known exceptions above src/${name} (KNOWN_SYNTH_UPWARD)`,
          severity: "error",
          from: { path: `^${escapeRegExp(file)}$` },
          to: { path: folders(forbidden), pathNot: allowed },
        });
      }
    }
  });
  return rules;
}

/** @type {import('dependency-cruiser').IConfiguration} */
module.exports = {
  forbidden: [
    ...layerRules(),
    {
      name: "pure-no-files",
      comment: 'physics, model and analyse are pure (DEVELOPERS.md, "Analysis is pure"): no file reading, no file system, processes or threads',
      severity: "error",
      from: { path: "^src/(physics|model|analyse)/" },
      to: { path: ["^src/read/", "^(node:)?(fs|fs/promises|child_process|worker_threads|net|http|https)$"] },
    },
    {
      name: "no-cycle-between-folders",
      comment: "modules of two folders of src/ import each other in a circle",
      severity: "error",
      from: { path: "^src/([^/]+)/" },
      to: { circular: true, viaSomeNot: "^src/$1/" },
    },
    {
      name: "layer-unknown-folder",
      comment: "a folder of src/ that has no place in LAYERS: give it one",
      severity: "error",
      from: { path: "^src/" },
      to: { path: "^src/", pathNot: folders(LAYERS.flat()) },
    },
    {
      name: "not-to-unresolvable",
      comment: "an import that resolves to no file",
      severity: "error",
      from: { path: "^src/" },
      to: { couldNotResolve: true },
    },
  ],
  options: {
    parser: "swc",
    tsPreCompilationDeps: true,
    doNotFollow: { path: "node_modules" },
    exclude: { path: "node_modules" },
    moduleSystems: ["es6"],
    enhancedResolveOptions: {
      extensions: [".ts", ".mjs", ".js"],
      exportsFields: ["exports"],
      conditionNames: ["import", "require", "node", "default"],
    },
  },
};
