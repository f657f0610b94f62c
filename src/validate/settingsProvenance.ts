/**
 * The analysis settings a wafer was analysed with, for its provenance: each setting's value in the
 * unit it is documented in (SETTING_SPECS; in the ASCII spelling, "ueV", because this goes into the exports —
 * results.json keeps ASCII units; the wafer page prints µ with microSign), rounded to six significant digits, and where the value
 * came from (the default, the site's analysis.yaml, or the wafer's own record).
 */
import { sig6 } from "../model/format.ts";
import { SETTING_SPECS } from "./settings.ts";
import type { WaferRecord } from "./wafer.ts";

export interface SettingProvenance {
  key: string;
  value: string;
  source: "default" | "site" | "wafer";
}

/** One entry per known setting, in SETTING_SPECS order; none without a record. */
export function settingsProvenance(record: WaferRecord | undefined, siteOverrides: Record<string, unknown>): SettingProvenance[] {
  if (!record) return [];
  return Object.keys(SETTING_SPECS).map((key) => {
    const spec = SETTING_SPECS[key as keyof typeof SETTING_SPECS];
    const v = record.settings[key as keyof typeof record.settings];
    let text: string;
    if (v === null) text = "derived from the data";
    else if (Array.isArray(v)) text = v.map((x) => `${(x / ("si" in spec ? spec.si : 1)).toPrecision(3)} ${"unit" in spec ? spec.unit : ""}`).join(" … ");
    else if (typeof v === "number") text = "unit" in spec ? `${sig6(v / spec.si)} ${spec.unit}` : String(v);
    else text = String(v);
    const source = key in record.settingOverrides ? "wafer" : key in siteOverrides ? "site" : "default";
    return { key, value: text, source };
  });
}
