/**
 * The "On this page" list of a wafer page: its sections in page order, only
 * those the page draws, each an anchor link (id, label). The appendix (left
 * out of print) lists its parts beneath it.
 */
export interface PageIndexEntry {
  id: string;
  label: string;
  children?: PageIndexEntry[];
}

export interface PageIndexInput {
  decision: boolean;
  problems: boolean;
  transport: boolean;
  uniformity: boolean;
  structure: boolean;
  images: boolean;
  stack: boolean;
  /** The predicted valley splitting inside the structure section, and the growth conditions. */
  valley?: boolean;
  growth?: boolean;
  /** Devices with per-sweep tables, and whether the transport analyses in depth exist. */
  deviceTables: boolean;
  transportDepth: boolean;
  /** Ids of the lattice-image blocks (their profile and numbers are in the appendix). */
  imageIds?: string[];
}

export function pageIndex(p: PageIndexInput): PageIndexEntry[] {
  const e = (on: boolean, id: string, label: string): PageIndexEntry[] => (on ? [{ id, label }] : []);
  return [
    { id: "summary", label: "Verdict" },
    ...e(p.decision, "decision", "Lab decision"),
    ...e(p.problems, "problems", "Input problems"),
    { id: "metrics", label: "Metrics against targets" },
    ...e(p.transport, "transport", "Magnetotransport"),
    ...e(p.uniformity, "uniformity", "Within-wafer uniformity"),
    ...(p.structure
      ? [
          {
            id: "structure",
            label: "Strain and interfaces",
            ...(p.valley ? { children: [{ id: "structure-valley", label: "Valley splitting (predicted)" }] } : {}),
          },
        ]
      : []),
    ...e(p.images, "images", "Lattice images"),
    ...e(p.stack, "stack", "Layer stack (design)"),
    ...e(!!p.growth, "growth", "Growth conditions"),
    { id: "notes", label: "Notes" },
    {
      id: "appendix",
      label: "Appendix (not printed)",
      children: [
        ...e(p.deviceTables, "appendix-sweeps", "Hall analysis per field sweep"),
        ...e(p.transportDepth, "transport-depth", "Transport in depth"),
        ...e(p.structure, "appendix-structure", "Strain and interfaces: tables and depth profiles"),
        ...(p.imageIds ?? []).map((id, k) => ({ id: `appendix-${id}`, label: `Lattice image ${k + 1}: profile and numbers` })),
        { id: "provenance", label: "Raw files and settings" },
        { id: "history", label: "History" },
      ],
    },
  ];
}
