/**
 * Facts of the invented demo scenario shared by the log generator and the seed: which cell fades
 * fast, and how each demo cell's true capacity differs from rated (a lot's normal spread).
 */
export const demoFadingSerial = "PB-0019";

export const demoCapacityFactors: Record<string, number> = {
  "PB-0007": 1.021,
  "PB-0012": 0.994,
};
