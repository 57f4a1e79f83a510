/**
 * Facts of the invented demo scenario shared by the log generator and the seed: which cell fades
 * fast, and how each demo cell's true capacity differs from rated (a lot's normal spread).
 */
export const demoFadingSerial = "PB-0019";

export const demoCapacityFactors: Record<string, number> = {
  "PB-0007": 1.021,
  "PB-0012": 0.994,
};

/** The two lots whose every cell gets a capacity check in the demo, with their invented spread. */
export const demoLots = [
  { prefix: "PA", cells: 24, meanFactor: 1.034, sdFactor: 0.009, seed: 1100 },
  // Lot B is a little weaker and has one low cell, so the QA views have something to show.
  { prefix: "PB", cells: 24, meanFactor: 1.016, sdFactor: 0.011, seed: 2200, lowCell: { serial: "PB-0015", factor: 0.962 } },
] as const;
