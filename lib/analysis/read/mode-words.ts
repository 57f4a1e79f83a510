/**
 * Words loggers write in a mode/state column, in English, German, French,
 * Spanish, Italian, Dutch and Portuguese, plus the one-letter codes C/D/R.
 * Returns +1 charging, -1 discharging, 0 resting, NaN when unrecognised.
 */
import { normaliseWords } from "./vocabulary";

const dischargeStems = ["discharg", "dischg", "dchg", "dsg", "entlad", "decharg", "descarg", "scaric", "ontlad"];
const dischargeWords = new Set(["d", "dis", "dch"]);
const chargeStems = ["charg", "chg", "chrg", "lad", "carg", "caric", "oplad"];
const chargeWords = new Set(["c", "ch", "cv", "cccv"]);
const restStems = ["rest", "paus", "idle", "ruhe", "repos", "repous", "ripos", "rust", "descans", "relax", "wait", "standby", "ocv"];
const restWords = new Set(["r", "open"]);

function matches(word: string, stems: readonly string[], words: ReadonlySet<string>): boolean {
  return words.has(word) || stems.some((stem) => word.startsWith(stem));
}

export function classifyMode(text: string): number {
  const words = normaliseWords(text);
  if (words.length === 0) return Number.NaN;
  // Discharge first: several discharge words contain a charge stem later on.
  if (words.some((w) => matches(w, dischargeStems, dischargeWords))) return -1;
  if (words.some((w) => matches(w, chargeStems, chargeWords))) return 1;
  if (words.some((w) => matches(w, restStems, restWords))) return 0;
  return Number.NaN;
}
