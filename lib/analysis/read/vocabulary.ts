/**
 * Header words that name a column's quantity, in English, German, French,
 * Spanish, Italian, Dutch and Portuguese (accents folded away).
 */

/** Lower-case, accent-free words of a header cell; camelCase is split ("TestTime" -> test, time). */
export function normaliseWords(text: string): string[] {
  const folded = text
    .replace(/([a-z])([A-Z][a-z])/g, "$1 $2")
    .toLowerCase()
    .replace(/ß/g, "ss")
    .normalize("NFD")
    .replace(/\p{M}/gu, "");
  return folded.split(/[^\p{L}\p{N}]+/u).filter((w) => w.length > 0);
}

export type WordRole = "time" | "voltage" | "current" | "temperature" | "mode" | "step" | "cycle" | "record";

interface RoleWords {
  /** Whole words. */
  words: readonly string[];
  /** Word endings, for compounds (German "Zellspannung", "Ladestrom", "Testzeit"). */
  endings?: readonly string[];
}

export const roleWords: Record<WordRole, RoleWords> = {
  time: {
    words: [
      "time", "zeit", "temps", "tiempo", "tempo", "tijd", "elapsed", "duration", "dauer", "duree", "duracion",
      "durata", "duur", "duracao", "timestamp", "datetime", "date", "datum", "fecha", "uhrzeit", "runtime",
      "horodatage", "heure", "hora", "tiempotranscurrido",
    ],
    endings: ["zeit", "time", "tijd"],
  },
  voltage: {
    words: [
      "voltage", "volt", "volts", "spannung", "tension", "tensione", "spanning", "tensao", "potential",
      "potenziale", "potencial", "ecell", "ewe", "vcell", "ucell", "u", "v",
    ],
    endings: ["spannung", "voltage", "spanning"],
  },
  current: {
    words: ["current", "strom", "courant", "corriente", "corrente", "stroom", "amp", "amps", "ampere", "amperage", "curr", "cur", "icell", "i"],
    endings: ["strom", "current", "stroom"],
  },
  temperature: {
    words: ["temperature", "temperatur", "temperatura", "temperatuur", "temp", "celsius", "thermocouple"],
    endings: ["temperatur", "temperature", "temperatuur", "temp"],
  },
  mode: {
    words: ["mode", "state", "status", "modus", "zustand", "etat", "estado", "modo", "stato", "toestand", "type", "typ", "tipo", "phase", "betriebsart"],
  },
  step: { words: ["step", "steps", "schritt", "etape", "paso", "passo", "stap", "etapa", "stufe"] },
  cycle: { words: ["cycle", "cycles", "zyklus", "zyklen", "ciclo", "ciclos", "cyclus", "loop"] },
  record: {
    words: [
      "record", "rec", "nr", "no", "num", "number", "index", "idx", "point", "datapoint", "punkt", "messpunkt",
      "row", "line", "zeile", "numero", "ligne", "fila", "riga", "regel", "linha", "id", "n", "sample", "seq", "sequence",
    ],
  },
};

/** Quantities a log may carry that must never be taken for time, voltage, current or temperature. */
export const excludedWords: readonly string[] = [
  "capacity", "kapazitat", "capacite", "capacidad", "capacita", "capaciteit", "capacidade",
  "energy", "energie", "energia", "power", "leistung", "puissance", "potencia", "potenza", "vermogen",
  "resistance", "widerstand", "resistencia", "resistenza", "weerstand", "impedance", "impedanz",
  "soc", "dod", "ah", "wh", "mah", "dq", "dqdv", "dvdq", "dcir", "ir",
];

/** Words that mark a setpoint or limit rather than a measurement: such columns lose to a plain one. */
export const setpointWords: readonly string[] = ["set", "setpoint", "soll", "limit", "target", "cutoff", "aux", "auxiliary"];

/**
 * Words that mark the surroundings' temperature rather than the cell's: such a column loses to the
 * cell's own (a Battery Data Format file carries both "Ambient Temperature / degC" and "Surface
 * Temperature T1 / degC"), and is still taken when it is the only temperature.
 */
export const ambientWords: readonly string[] = ["ambient", "umgebung", "ambiante", "ambiente", "room", "chamber", "kammer", "environment"];

/** Words that make a time column the step's own clock rather than the test's. */
export const stepClockWords: readonly string[] = ["step", "schritt", "etape", "paso", "passo", "stap", "etapa"];

export function hasRoleWord(words: readonly string[], role: WordRole): boolean {
  const entry = roleWords[role];
  return words.some(
    (w) => entry.words.includes(w) || (entry.endings?.some((ending) => w.length > ending.length && w.endsWith(ending)) ?? false),
  );
}

export function hasAnyWord(words: readonly string[], list: readonly string[]): boolean {
  return words.some((w) => list.includes(w));
}
