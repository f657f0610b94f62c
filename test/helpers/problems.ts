import { formatProblem, InputError } from "../../src/model/problem.ts";

/** Runs fn, which must throw an InputError, and returns the formatted one-line message. */
export function problemMessage(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputError) return formatProblem(e.problem);
    throw e;
  }
  throw new Error("expected an InputError");
}
