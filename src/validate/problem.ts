/** Shim: Problem, InputError and ProblemList live in src/model/problem.ts. Remove once no branch imports this path (DEVELOPERS.md, shims). */
export * from "../model/problem.ts";
