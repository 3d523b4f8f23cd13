import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { decideCall, type Interval } from "@/lib/sequential";

// The rules of DESIGN.md §3 "Calls"; no outside reference value is involved (the thresholds are the plan's).
describe("decideCall without a relative sequence (suspect > harm > lift > flat > horizon > collecting)", () => {
  const base = {
    healthy: true,
    p: 0.5,
    cs: [-0.01, 0.02] as Interval,
    relativeCs: null,
    significanceLevel: 0.05,
    minimumAbsoluteLift: 0.01,
    minimumRelativeLift: 0.1,
    horizonReached: false,
  };
  it("applies the rules in precedence order on the absolute sequence", () => {
    expect(decideCall(base)).toBe("collecting");
    expect(decideCall({ ...base, horizonReached: true })).toBe("horizon");
    expect(decideCall({ ...base, cs: [-0.01, 0.009] })).toBe("flat");
    expect(decideCall({ ...base, cs: [-0.01, 0.009], minimumAbsoluteLift: null })).toBe("collecting");
    expect(decideCall({ ...base, p: 0.01, cs: [0.001, 0.02] })).toBe("lift");
    expect(decideCall({ ...base, p: 0.01, cs: [-0.02, -0.001] })).toBe("harm");
    expect(decideCall({ ...base, p: 0.01, cs: [-0.02, -0.001], healthy: false })).toBe("suspect");
    expect(decideCall({ ...base, p: 0.01, cs: [0.001, 0.005], horizonReached: true })).toBe("lift");
  });
  it("throws a RangeError for each guard", () => {
    expect(() => decideCall({ ...base, p: NaN })).toThrow(/decideCall requires p in \[0, 1\]/);
    expect(() => decideCall({ ...base, cs: [NaN, 1] })).toThrow(/decideCall requires a confidence sequence without NaN/);
    expect(() => decideCall({ ...base, relativeCs: [-0.1, NaN] })).toThrow(/decideCall requires a relative confidence sequence without NaN/);
  });
});

describe("decideCall with a relative sequence: a stop needs every printed sequence to agree", () => {
  // Planned baseline 4 %, minimum lift +10 %: the absolute minimum is 0.004 (the lift chart's line).
  const base = {
    healthy: true,
    p: 0.43,
    cs: [-0.0011, 0.0038] as Interval,
    relativeCs: [-0.037, 0.119] as Interval,
    significanceLevel: 0.025,
    minimumAbsoluteLift: 0.004,
    minimumRelativeLift: 0.1,
    horizonReached: false,
  };
  it("does not call flat while the relative sequence holds the minimum lift (holdout below the planned baseline)", () => {
    expect(decideCall(base)).toBe("collecting");
    expect(decideCall({ ...base, relativeCs: null })).toBe("flat"); // the old absolute-only reading
    expect(decideCall({ ...base, relativeCs: [-0.037, 0.099] })).toBe("flat");
  });
  it("does not call flat while the absolute sequence holds the chart's minimum (holdout above the planned baseline)", () => {
    expect(decideCall({ ...base, cs: [-0.001, 0.0045], relativeCs: [-0.02, 0.08] })).toBe("collecting");
    expect(decideCall({ ...base, cs: [-0.001, 0.0039], relativeCs: [-0.02, 0.08] })).toBe("flat");
    expect(decideCall({ ...base, cs: [-0.001, 0.0039], relativeCs: [-0.02, 0.08], minimumRelativeLift: null })).toBe("collecting");
  });
  it("calls lift and harm only when both sequences exclude zero on the same side", () => {
    expect(decideCall({ ...base, p: 0.001, cs: [0.0001, 0.01], relativeCs: [-0.001, 0.3] })).toBe("collecting");
    expect(decideCall({ ...base, p: 0.001, cs: [0.0001, 0.01], relativeCs: [0.001, 0.3] })).toBe("lift");
    expect(decideCall({ ...base, p: 0.03, cs: [0.0001, 0.01], relativeCs: [0.001, 0.3] })).toBe("collecting");
    // not harm, since the relative sequence still holds 0; both lie below the minimum lift, so flat
    expect(decideCall({ ...base, p: 0.001, cs: [-0.01, -0.0001], relativeCs: [-0.3, 0.001] })).toBe("flat");
    expect(decideCall({ ...base, p: 0.001, cs: [-0.01, -0.0001], relativeCs: [-0.3, 0.001], minimumRelativeLift: null })).toBe("collecting");
    expect(decideCall({ ...base, p: 0.001, cs: [-0.01, -0.0001], relativeCs: [-0.3, -0.001] })).toBe("harm");
    expect(decideCall({ ...base, p: 0.001, cs: [-0.01, -0.0001], relativeCs: [-0.3, -0.001], healthy: false })).toBe("suspect");
  });
  it("makes no call on a relative sequence that is not estimable yet", () => {
    expect(decideCall({ ...base, p: 0.001, cs: [0.0001, 0.01], relativeCs: [-1, Infinity] })).toBe("collecting");
    expect(decideCall({ ...base, relativeCs: [-1, Infinity], horizonReached: true })).toBe("horizon");
  });

  it("never contradicts the intervals it is given (property)", () => {
    const end = fc.double({ min: -0.5, max: 0.5, noNaN: true });
    const interval = fc.tuple(end, end).map(([a, b]) => (a <= b ? [a, b] : [b, a]) as Interval);
    fc.assert(
      fc.property(
        fc.record({
          healthy: fc.boolean(),
          p: fc.double({ min: 0, max: 1, noNaN: true }),
          cs: interval,
          relativeCs: fc.option(interval, { nil: null }),
          significanceLevel: fc.constantFrom(0.05, 0.025, 0.01),
          minimumAbsoluteLift: fc.option(fc.double({ min: 1e-4, max: 0.3, noNaN: true }), { nil: null }),
          minimumRelativeLift: fc.option(fc.double({ min: 1e-3, max: 0.5, noNaN: true }), { nil: null }),
          horizonReached: fc.boolean(),
        }),
        (input) => {
          const call = decideCall(input);
          const relative = input.relativeCs;
          const harm = input.cs[1] < 0 && (relative === null || relative[1] < 0);
          const lift = input.p < input.significanceLevel && input.cs[0] > 0 && (relative === null || relative[0] > 0);
          const absoluteFlat = input.minimumAbsoluteLift !== null && input.cs[1] < input.minimumAbsoluteLift;
          const flat =
            relative === null
              ? absoluteFlat
              : input.minimumRelativeLift !== null && relative[1] < input.minimumRelativeLift && (input.minimumAbsoluteLift === null || absoluteFlat);
          if (!input.healthy) {
            expect(call).toBe("suspect");
            return;
          }
          expect(call === "harm").toBe(harm);
          expect(call === "lift").toBe(!harm && lift);
          expect(call === "flat").toBe(!harm && !lift && flat);
          if (call === "horizon" || call === "collecting") expect(call === "horizon").toBe(input.horizonReached);
        },
      ),
      { numRuns: 500 },
    );
  });
});
