import { describe, expect, it } from "vitest";
import { formatClock, formatCRate, formatMah, formatNumber, formatPercent, missing, withUnit } from "@/lib/notebook/format";

describe("formatClock (h:mm:ss)", () => {
  it("splits seconds into hours, minutes and seconds", () => {
    // 1 h = 3600 s, 1 min = 60 s (SI Brochure, 9th ed., Table 8): 39,170 s = 10 h + 52 min + 50 s.
    expect(formatClock(39170.1)).toBe("10:52:50");
    // Hours past 24 stay hours, as a week-long cycle-life log needs: 545,042 s = 151 h + 24 min + 2 s.
    expect(formatClock(545042)).toBe("151:24:02");
    expect(formatClock(0)).toBe("0:00:00");
  });

  it("rounds once, so 59.96 s never shows as 60 seconds", () => {
    expect(formatClock(59.96)).toBe("0:01:00");
    expect(formatClock(3599.6)).toBe("1:00:00");
  });

  it("keeps tenths for pulse times and writes a dash for no value", () => {
    // 309.8 s = 5 min + 9.8 s.
    expect(formatClock(309.8, { tenths: true })).toBe("0:05:09.8");
    expect(formatClock(null)).toBe(missing);
    expect(formatClock(Number.NaN)).toBe(missing);
  });
});

describe("formatCRate", () => {
  it("writes C/x with x = rated capacity / current", () => {
    // C/x = rated capacity / current (common practice); the domain notes' example: C/20 on a 2000 mAh cell is 100 mA.
    expect(formatCRate(0.1, 2000)).toBe("C/20");
    // 1C = rated capacity in mA (common practice, no source): 50 mA on 1000 mAh is C/20, either sign.
    expect(formatCRate(-0.05, 1000)).toBe("C/20");
    expect(formatCRate(0.5, 1000)).toBe("C/2");
  });

  it("writes 1C and more as a multiple, and a dash without a rated capacity", () => {
    expect(formatCRate(2, 1000)).toBe("2C");
    expect(formatCRate(1, 1000)).toBe("1C");
    expect(formatCRate(0.1, null)).toBe(missing);
    expect(formatCRate(0, 1000)).toBe(missing);
  });
});

describe("numbers", () => {
  it("uses a true minus sign and no sign on a rounded zero", () => {
    expect(formatNumber(-1.25, 1)).toBe("\u22121.3");
    expect(formatNumber(-0.0004, 3)).toBe("0.000");
    expect(formatNumber(Number.POSITIVE_INFINITY, 1)).toBe(missing);
  });

  it("keeps the unit with the number by a no-break space", () => {
    expect(formatMah(1093.405)).toBe("1093.4\u00a0mAh");
    expect(withUnit(null, 1, "V")).toBe(missing);
    // CE as a percentage: 0.99990434 × 100 = 99.990434 → 99.99 %.
    expect(formatPercent(0.99990434, 2)).toBe("99.99\u00a0%");
  });
});
