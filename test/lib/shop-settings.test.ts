import { describe, expect, it } from "vitest";
import { formatErrorRateInput, readErrorRate } from "~/lib/shop-settings";

// 1 in = 25.4 mm and 1 ft = 0.3048 m exactly (NIST, TRADE-FACTS §5), so 1 in/ft = 83 333.3 µm/m.
describe("the sled's squareness tolerance", () => {
  it("reads a bare number in the shop's unit, or with its unit named", () => {
    expect(readErrorRate("0.15", "mm")).toEqual({ ok: true, umPerM: 150 });
    expect(readErrorRate("0,2 mm/m", "in")).toEqual({ ok: true, umPerM: 200 });
    expect(readErrorRate("0.25 mm per metre", "mm")).toEqual({ ok: true, umPerM: 250 });
    expect(readErrorRate("0.002", "in")).toEqual({ ok: true, umPerM: 167 }); // 0.002 × 25 400 / 0.3048 = 166.67
    expect(readErrorRate('.003 in per foot', "mm")).toEqual({ ok: true, umPerM: 250 });
    expect(readErrorRate('0.001"/ft', "mm")).toEqual({ ok: true, umPerM: 83 });
  });

  it("names what is wrong with nonsense and with a figure out of range", () => {
    expect(readErrorRate("square", "mm")).toEqual({ ok: false, error: "Enter an error per length of cut, such as 0.15 mm/m." });
    expect(readErrorRate("0.15 mm", "mm")).toMatchObject({ ok: false });
    expect(readErrorRate("-0.1", "mm")).toMatchObject({ ok: false });
    expect(readErrorRate("0", "mm")).toEqual({ ok: false, error: "Must be between 0.01 and 5 mm per metre." });
    expect(readErrorRate("6", "mm")).toEqual({ ok: false, error: "Must be between 0.01 and 5 mm per metre." });
    expect(readErrorRate("0.1", "in")).toEqual({ ok: false, error: "Must be between 0.00012 and 0.06 in per foot." });
  });

  it("shows the stored figure in the shop's unit, and reads what it shows back", () => {
    expect(formatErrorRateInput(150, "mm")).toBe("0.150 mm/m");
    expect(formatErrorRateInput(150, "in")).toBe("0.0018 in/ft");
    expect(readErrorRate(formatErrorRateInput(150, "mm"), "mm")).toEqual({ ok: true, umPerM: 150 });
  });
});
