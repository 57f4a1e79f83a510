import { describe, expect, it } from "vitest";
import { formatCapacitySpec, formatTemperatureWindow, formatTermination } from "@/lib/registry/format";

describe("formatTermination", () => {
  it("writes fractions of 1C as the trade does", () => {
    // C/20 = 0.05C: 100 mA on a 2000 mAh cell (see /work/shared/notes/domain.md, units and rates).
    expect(formatTermination(0.05)).toBe("C/20");
    // 0.01C and 0.02C are seen in public specifications; C/10 is common practice, no source.
    expect(formatTermination(0.01)).toBe("C/100");
    expect(formatTermination(0.02)).toBe("C/50");
    expect(formatTermination(0.1)).toBe("C/10");
    expect(formatTermination(1)).toBe("1C");
  });

  it("keeps a fraction that is not one over a whole number as a multiple of C", () => {
    expect(formatTermination(0.03)).toBe("0.03C");
    expect(formatTermination(0.075)).toBe("0.075C");
    expect(formatTermination(0)).toBe("—");
  });
});

describe("formatTemperatureWindow and formatCapacitySpec", () => {
  it("writes windows with a true minus sign and specs one- or two-sided", () => {
    expect(formatTemperatureWindow(-20, 60)).toBe("−20 to 60 °C");
    expect(formatTemperatureWindow(0, 45)).toBe("0 to 45 °C");
    expect(formatCapacitySpec(950, null)).toBe("≥ 950 mAh");
    expect(formatCapacitySpec(950, 1050)).toBe("950–1050 mAh");
  });
});
