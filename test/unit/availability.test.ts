import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  chainAvailabilityPct,
  chainAvailabilityProductPct,
  chainAvailabilitySumPct,
} from "../../src/physics/availability.ts";
import { expectClose } from "../helpers/expect-close.ts";

describe("chain availability", () => {
  it("two hops of 99.99 %: sum 99.98 %, product 99.980001 %", () => {
    expectClose(chainAvailabilitySumPct([99.99, 99.99]), 99.98, { abs: 1e-12 }, "sum");
    expectClose(chainAvailabilityProductPct([99.99, 99.99]), 99.980001, { abs: 1e-12 }, "product");
  });

  it("default is the sum; product on request; an empty chain is 100 %", () => {
    expect(chainAvailabilityPct([99.9, 99.5])).toBe(chainAvailabilitySumPct([99.9, 99.5]));
    expect(chainAvailabilityPct([99.9, 99.5], { method: "product" })).toBe(chainAvailabilityProductPct([99.9, 99.5]));
    expect(chainAvailabilityPct([])).toBe(100);
  });

  it("product ≥ sum, and they differ by the second-order terms Σ_{i<j} U_i·U_j/100 (exact for two hops)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 10, noNaN: true }), fc.double({ min: 0, max: 10, noNaN: true }), (u1, u2) => {
        const list = [100 - u1, 100 - u2];
        const sum = chainAvailabilitySumPct(list);
        const product = chainAvailabilityProductPct(list);
        expectClose(product - sum, (u1 * u2) / 100, { abs: 1e-9 }, { u1, u2 });
        return product >= sum - 1e-12;
      }),
    );
  });

  it("does not change the caller's list and rejects values outside 0–100 %", () => {
    const list = [99.9, 99.8];
    chainAvailabilityPct(list, { method: "product" });
    expect(list).toEqual([99.9, 99.8]);
    expect(chainAvailabilitySumPct([101])).toBeNaN();
    expect(chainAvailabilityProductPct([NaN])).toBeNaN();
  });
});
