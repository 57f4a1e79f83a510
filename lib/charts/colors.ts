/**
 * Chart colours come from the palette's tokens (app/globals.css); canvases need them as text, with
 * an alpha for shading. Line styles differ by dash as well as colour, so traces stay apart in grey
 * print and for readers who do not tell the colours apart.
 */

export type ColorToken =
  | "ink"
  | "ink-soft"
  | "sheet"
  | "paper"
  | "copper"
  | "copper-dark"
  | "charge"
  | "discharge"
  | "rest"
  | "danger"
  | "warn"
  | "ok"
  | "rule"
  | "rule-strong";

/** "#1d6a8a" (or "#18a") with alpha 0.2 → "rgba(29, 106, 138, 0.2)"; other colour text is returned as it is. */
export function withAlpha(color: string, alpha: number): string {
  const hex = color.trim().replace(/^#/, "");
  const full = hex.length === 3 ? [...hex].map((c) => c + c).join("") : hex;
  if (!/^[0-9a-f]{6}$/i.test(full)) return color;
  const n = Number.parseInt(full, 16);
  const a = Math.max(0, Math.min(1, alpha));
  return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, ${a})`;
}

/** Dash patterns (CSS pixels) for up to six traces on one chart, solid first. */
export const dashes: readonly (number[] | undefined)[] = [undefined, [8, 4], [2, 3], [10, 3, 2, 3], [4, 4], [12, 3, 2, 3, 2, 3]];

/** Token colours in rotation for overlays of several runs or cells. */
export const overlayTokens: readonly ColorToken[] = ["charge", "discharge", "copper", "ink", "ok", "danger"];

export function overlayStyle(index: number): { token: ColorToken; dash: number[] | undefined } {
  // Colour and dash change together, so neighbours in the legend differ in grey print as well.
  return { token: overlayTokens[index % overlayTokens.length] as ColorToken, dash: dashes[index % dashes.length] };
}
