/**
 * Hostile inputs for the reader, built from a seeded generator so a failing case can be rebuilt
 * from its name alone. Each family aims at one way a bench log arrives broken: noise, a cut-off
 * transfer, a runaway line, a runaway header, the wrong text encoding, or odd delimiters/quotes.
 */
import { capacityCheckCsv } from "../../support/bench-logs";
import { createPrng, type Prng } from "../../support/sim/prng";

export interface FuzzCase {
  name: string;
  bytes: Uint8Array;
  /** Data rows a correct reader must deliver, when the case is a valid log in disguise. */
  rows?: number;
  /** The rejection a correct reader must give, when the case is broken in one known way. */
  rejects?: { code: string; line?: number };
}

const utf8 = (text: string): Uint8Array => new TextEncoder().encode(text);
const int = (rng: Prng, lo: number, hi: number): number => lo + Math.floor(rng.next() * (hi - lo + 1));
const pick = <T>(rng: Prng, items: readonly T[]): T => items[Math.floor(rng.next() * items.length)] as T;

/** A small valid log (about 290 rows, 10 kB): a capacity check logged once a minute. */
export function validLog(seed: number): { text: string; rows: number } {
  const text = capacityCheckCsv(seed, { logInterval_s: 60 });
  return { text, rows: text.trimEnd().split("\n").length - 1 };
}

function randomBytes(rng: Prng, n: number): Uint8Array {
  const out = new Uint8Array(n);
  for (let k = 0; k < n; k++) out[k] = int(rng, 0, 255);
  return out;
}

/** Text made of a log's own alphabet, so it gets past the binary check and into the parser. */
function logLikeNoise(rng: Prng, n: number): Uint8Array {
  const alphabet = "0123456789.,;:-+eE \t\"'\r\n\n\nVvAaTtsime_()°µ";
  let text = "";
  for (let k = 0; k < n; k++) text += pick(rng, [...alphabet]);
  return utf8(text);
}

function latin1(text: string): Uint8Array {
  const out = new Uint8Array(text.length);
  for (let k = 0; k < text.length; k++) out[k] = text.charCodeAt(k) & 0xff;
  return out;
}

function utf16(text: string, order: "le" | "be", bom: boolean): Uint8Array {
  const units = (bom ? "\ufeff" : "") + text;
  const out = new Uint8Array(units.length * 2);
  for (let k = 0; k < units.length; k++) {
    const u = units.charCodeAt(k);
    out[2 * k + (order === "le" ? 0 : 1)] = u & 0xff;
    out[2 * k + (order === "le" ? 1 : 0)] = u >>> 8;
  }
  return out;
}

function concat(...parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
}

/** The same log with a header word in French, so Latin-1 and UTF-16 bytes differ from ASCII. */
function accentedLog(seed: number): { text: string; rows: number } {
  const { text, rows } = validLog(seed);
  return { text: text.replace("temperature_degC", "température (°C)"), rows };
}

function randomBytesCases(rng: Prng, n: number): FuzzCase[] {
  return Array.from({ length: n }, (_, k) => {
    const size = int(rng, 0, 4096);
    return k % 2 === 0 ? { name: `random bytes #${k} (${size} B)`, bytes: randomBytes(rng, size) } : { name: `log-like noise #${k} (${size} B)`, bytes: logLikeNoise(rng, size) };
  });
}

function truncatedCases(rng: Prng, n: number): FuzzCase[] {
  return Array.from({ length: n }, (_, k) => {
    const bytes = utf8(validLog(k + 1).text);
    const cut = int(rng, 0, bytes.length - 1);
    return { name: `valid log cut at byte ${cut} of ${bytes.length} (#${k})`, bytes: bytes.subarray(0, cut) };
  });
}

function enormousLineCases(): FuzzCase[] {
  const megabytes = (mb: number, fill: string) => fill.repeat(Math.ceil((mb * 1024 * 1024) / fill.length));
  const { text } = validLog(91);
  const lines = text.split("\n");
  // Physical line 11 becomes several megabytes of digits and commas with no newline.
  const middle = [...lines.slice(0, 10), megabytes(3, "3.7,"), ...lines.slice(10)].join("\n");
  return [
    { name: "3 MB of one line without a newline", bytes: utf8(megabytes(3, "1234567890")), rejects: { code: "line-too-long", line: 1 } },
    { name: "header, then a 4 MB line", bytes: utf8(`${lines[0] ?? ""}\n${megabytes(4, "4.1,0.5,")}`), rejects: { code: "line-too-long", line: 2 } },
    { name: "valid log with a 3 MB line 11", bytes: utf8(middle), rejects: { code: "line-too-long", line: 11 } },
  ];
}

function manyColumnCases(rng: Prng): FuzzCase[] {
  return [2000, 5000].flatMap((width) => {
    const header = Array.from({ length: width }, (_, c) => `channel_${c}`).join(",");
    const row = () => Array.from({ length: width }, () => (3 + rng.next()).toFixed(3)).join(",");
    const wide = `${header}\n${row()}\n${row()}\n`;
    const { text } = validLog(width);
    const padded = text
      .split("\n")
      .map((line, k) => (line === "" ? line : `${line},${Array.from({ length: width }, (_, c) => (k === 0 ? `extra_${c}` : "0")).join(",")}`))
      .join("\n");
    return [
      { name: `${width} columns of unnamed channels`, bytes: utf8(wide), rejects: { code: "too-many-columns", line: 1 } },
      { name: `valid log padded to ${width + 4} columns`, bytes: utf8(padded), rejects: { code: "too-many-columns", line: 1 } },
    ];
  });
}

function encodingCases(rng: Prng, n: number): FuzzCase[] {
  const cases: FuzzCase[] = [];
  for (let k = 0; k < n; k++) {
    const { text, rows } = accentedLog(100 + k);
    const crlf = k % 3 === 0 ? text.replaceAll("\n", "\r\n") : text;
    switch (k % 6) {
      case 0:
        cases.push({ name: `UTF-16LE with BOM #${k}`, bytes: utf16(crlf, "le", true), rows });
        break;
      case 1:
        cases.push({ name: `UTF-16BE with BOM #${k}`, bytes: utf16(crlf, "be", true), rows });
        break;
      case 2:
        cases.push({ name: `UTF-16LE without BOM #${k}`, bytes: utf16(crlf, "le", false), rows });
        break;
      case 3:
        cases.push({ name: `Latin-1 #${k}`, bytes: latin1(crlf), rows });
        break;
      case 4: {
        // A transfer that switched encodings part-way, cut at a random place.
        const bytes = utf8(crlf);
        const at = int(rng, 0, bytes.length);
        cases.push({ name: `UTF-8 then UTF-16LE from byte ${at} #${k}`, bytes: concat(bytes.subarray(0, at), utf16(crlf.slice(at), "le", false)) });
        break;
      }
      default: {
        const at = int(rng, 0, crlf.length);
        cases.push({ name: `UTF-8 then Latin-1 from char ${at} #${k}`, bytes: concat(utf8(crlf.slice(0, at)), latin1(crlf.slice(at))) });
      }
    }
  }
  // UTF-16 cut in the middle of a code unit.
  const odd = utf16(validLog(7).text, "le", true);
  cases.push({ name: "UTF-16LE cut at an odd byte", bytes: odd.subarray(0, odd.length - 1) });
  return cases;
}

function delimiterCases(rng: Prng, n: number): FuzzCase[] {
  const delimiters = [",", ";", "\t", "|", " ", ":"] as const;
  const quotes = ['"', "'"] as const;
  return Array.from({ length: n }, (_, k) => {
    const delimiter = pick(rng, delimiters);
    const quote = pick(rng, quotes);
    const quoteRate = rng.next() * 0.5;
    const strayRate = k % 3 === 0 ? rng.next() * 0.02 : 0;
    const lines = validLog(200 + k).text.split("\n");
    const text = lines
      .map((line) =>
        line
          .split(",")
          .map((field) => {
            let out = rng.next() < quoteRate ? `${quote}${field}${quote}` : field;
            if (rng.next() < strayRate) out = out.slice(0, 1) + pick(rng, quotes) + out.slice(1);
            return out;
          })
          .join(delimiter),
      )
      .join(rng.next() < 0.3 ? "\r\n" : "\n");
    return { name: `delimiter ${JSON.stringify(delimiter)}, quote ${quote} at ${quoteRate.toFixed(2)}, stray ${strayRate.toFixed(3)} (#${k})`, bytes: utf8(text) };
  });
}

/** Every case of the suite, rebuilt the same way from the same seed. */
export function fuzzCases(seed: number): FuzzCase[] {
  const rng = createPrng(seed);
  return [
    ...randomBytesCases(rng, 80),
    ...truncatedCases(rng, 80),
    ...enormousLineCases(),
    ...manyColumnCases(rng),
    ...encodingCases(rng, 36),
    ...delimiterCases(rng, 80),
  ];
}
