// The reason the valley figures are not judged when the field comes from a Hall density and parallel conduction
// is flagged: the density may include the parallel channel (it is not known to be wholly someone else's).
import { describe, expect, it } from "vitest";
import { valleyPremises } from "../../../src/analyse/structure/index.ts";

describe("valley premises: parallel conduction", () => {
  it("says the Hall density may include the parallel channel", () => {
    const v = { ok: true, departure: { ranges: [] }, fieldSource: "density" } as unknown as Parameters<typeof valleyPremises>[0];
    const ctx = { parallelConduction: true } as unknown as Parameters<typeof valleyPremises>[1];
    const reason = valleyPremises(v, ctx);
    expect(reason).toBe("the field comes from the Hall density, and parallel conduction is flagged, so that density may include the parallel channel");
    expect(valleyPremises(v, { ...ctx, parallelConduction: false })).toBeNull();
  });
});
