import { describe, expect, it } from "vitest";
import { dashes, overlayStyle, withAlpha } from "@/lib/charts/colors";
import { histogramBars } from "@/lib/charts/histogram-bars";
import { histogram } from "@/lib/stats/histogram";

describe("withAlpha", () => {
  it("reads #rrggbb and #rgb hex colours", () => {
    // CSS Color Module Level 4, §5.2 hex notation: 1d = 29, 6a = 106, 8a = 138; #18a is #1188aa.
    expect(withAlpha("#1d6a8a", 0.2)).toBe("rgba(29, 106, 138, 0.2)");
    expect(withAlpha(" #18a", 1.5)).toBe("rgba(17, 136, 170, 1)");
    expect(withAlpha("steelblue", 0.3)).toBe("steelblue");
  });
});

describe("overlayStyle", () => {
  it("changes dash with colour, so neighbours differ in grey print", () => {
    const styles = Array.from({ length: 6 }, (_, i) => overlayStyle(i));
    expect(new Set(styles.map((s) => JSON.stringify(s.dash))).size).toBe(dashes.length);
    expect(styles[0]?.dash).toBeUndefined();
  });
});

describe("histogramBars", () => {
  it("puts bars at bin centres and widens the range to both spec limits", () => {
    const h = histogram([1000, 1010, 1012, 1020, 1030, 1031, 1040], { rule: "sturges", spec: { lsl: 980, usl: 1080 } });
    if (!h) throw new Error("no histogram");
    const bars = histogramBars(h);
    // A bin's centre is the mean of its edges.
    bars.x.forEach((x, i) => expect(x).toBeCloseTo(((h.bins[i]?.from ?? 0) + (h.bins[i]?.to ?? 0)) / 2, 9));
    expect(bars.counts.reduce((a, b) => a + b, 0)).toBe(7);
    expect(bars.range.min).toBeLessThan(980);
    expect(bars.range.max).toBeGreaterThan(1080);
    expect([bars.lsl, bars.usl]).toEqual([980, 1080]);
  });
});
