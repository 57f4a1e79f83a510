/**
 * Writes a termination current given as a fraction of 1C the way the trade says it: 0.05 → "C/20".
 * Fractions that are not one over a whole number stay as a multiple of C (0.03 → "0.03C").
 */
export function formatTermination(fractionOfC: number): string {
  if (!(fractionOfC > 0)) return "—";
  const divisor = 1 / fractionOfC;
  const whole = Math.round(divisor);
  if (whole >= 1 && Math.abs(divisor - whole) < 1e-6 * whole) return whole === 1 ? "1C" : `C/${whole}`;
  return `${Number(fractionOfC.toPrecision(3))}C`;
}

/** A temperature window such as "0 to 45 °C" (a minus sign, not a hyphen, for readers and print). */
export function formatTemperatureWindow(minC: number, maxC: number): string {
  const show = (t: number) => (t < 0 ? `−${Math.abs(t)}` : String(t));
  return `${show(minC)} to ${show(maxC)} °C`;
}

/** A capacity spec limit pair: "950–1050 mAh", or "≥ 950 mAh" for a one-sided spec. */
export function formatCapacitySpec(lslMah: number, uslMah: number | null): string {
  return uslMah === null ? `≥ ${lslMah} mAh` : `${lslMah}–${uslMah} mAh`;
}
