/** Shim: number and unit formatting lives in src/model/format.ts. Remove once no branch imports this path (DEVELOPERS.md, shims). */
export * from "../model/format.ts";
