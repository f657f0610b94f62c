/**
 * JSON Schema of a wafer record's front matter (wafer.md), checked with Ajv.
 * The prose version, with examples, is docs/formats.md; keep the two together.
 */
import { DECISION_SCHEMA } from "./decision.ts";
export const ID_PATTERN = "^(?!.*\\.\\.)[A-Za-z0-9][A-Za-z0-9._-]{0,63}$";
/** ID_PATTERN compiled once (no `g` flag, so `test` keeps no state): wafer, run and device ids, and wafer folder and run file names. */
export const WAFER_ID = new RegExp(ID_PATTERN);

/** Reading instructions for files as the instruments write them (src/validate/readingRules.ts, docs/formats.md). */
const READING = {
  columns: { type: "object", maxProperties: 64, additionalProperties: { type: "string", minLength: 1 } },
  layout: {
    type: "object",
    additionalProperties: false,
    properties: {
      separator: { enum: ["comma", "semicolon", "tab", "whitespace"] },
      decimal: { enum: ["point", "comma"] },
      header_row: { type: "integer", minimum: 1, maximum: 100000 },
    },
  },
  conditions: {
    type: "object",
    maxProperties: 16,
    additionalProperties: {
      type: "object",
      additionalProperties: false,
      properties: {
        file_name: { type: "string", minLength: 1 },
        line: { type: "string", minLength: 1 },
        value: { type: ["string", "number"] },
        unit: { type: "string", minLength: 1 },
      },
    },
  },
} as const;

const fileSet = {
  type: "object",
  additionalProperties: false,
  required: ["files"],
  properties: { files: { type: "string", minLength: 1 }, ...READING },
};

export const WAFER_SCHEMA = {
  type: "object",
  additionalProperties: false,
  required: ["wafer", "run", "grown"],
  properties: {
    wafer: { type: "string", pattern: ID_PATTERN },
    run: { type: "string", pattern: ID_PATTERN },
    grown: { type: "string", pattern: "^\\d{4}-\\d{2}-\\d{2}$" },
    grade: { type: "string", minLength: 1 },
    reactor: { type: "string", minLength: 1 },
    title: { type: "string" },
    stack: {
      type: "array",
      items: {
        type: "object",
        additionalProperties: false,
        required: ["name", "role"],
        properties: {
          name: { type: "string", minLength: 1 },
          role: { enum: ["substrate", "buffer", "barrier", "well", "cap", "other"] },
          material: { type: "string" },
          ge: { type: "number", minimum: 0, maximum: 1 },
          thickness_nm: { type: "number", exclusiveMinimum: 0 },
        },
      },
    },
    devices: {
      type: "array",
      items: {
        type: "object",
        additionalProperties: false,
        required: ["id", "geometry", "files"],
        properties: {
          id: { type: "string", pattern: ID_PATTERN },
          geometry: { enum: ["hall-bar", "van-der-pauw"] },
          length_um: { type: "number", exclusiveMinimum: 0 },
          width_um: { type: "number", exclusiveMinimum: 0 },
          at_mm: { type: "array", items: { type: "number" }, minItems: 2, maxItems: 2 },
          files: { type: "string", minLength: 1 },
          ...READING,
        },
      },
    },
    analysis: { type: "object" },
    xrd: fileSet,
    profiles: fileSet,
    images: {
      type: "array",
      items: {
        type: "object",
        additionalProperties: false,
        required: ["file", "kind", "growth_axis"],
        properties: {
          file: { type: "string", minLength: 1 },
          pixel_nm: { type: "number", exclusiveMinimum: 0 },
          kind: { enum: ["haadf", "hrtem"] },
          growth_axis: { enum: ["up", "down", "left", "right"] },
          reference: { type: "array", items: { type: "integer", minimum: 0 }, minItems: 4, maxItems: 4 },
        },
      },
    },
    waivers: {
      type: "array",
      items: {
        type: "object",
        additionalProperties: false,
        // Exactly one of metric or finding: checked in wafer.ts, with a located message.
        required: ["reason", "approved_by", "date"],
        properties: {
          metric: { type: "string" },
          finding: { type: "string" },
          reason: { type: "string", minLength: 1 },
          approved_by: { type: "string", minLength: 1 },
          date: { type: "string", pattern: "^\\d{4}-\\d{2}-\\d{2}$" },
        },
      },
    },
    decision: DECISION_SCHEMA,
    // Checked field by field in growth.ts, with located messages.
    growth: { type: "object" },
  },
} as const;

/** Human words for each field, used in messages. */
export const FIELD_HINTS: Record<string, string> = {
  wafer: "the wafer id, equal to its folder name",
  run: "the growth run id",
  grown: "the growth date as YYYY-MM-DD",
  geometry: "hall-bar or van-der-pauw",
  role: "substrate, buffer, barrier, well, cap or other",
  state: "released, held or rejected (the lab's decision on the wafer)",
};
