/**
 * The byte-level cell parsers against outside references: Number() and
 * Date.UTC / Date.parse as the ECMAScript specification defines them, and the
 * text parsers used by the papaparse path.
 */
import { describe, expect, it } from "vitest";
import { daysFromCivil, validDate } from "@/lib/analysis/read/civil-time";
import {
  fieldBad,
  fieldEmpty,
  fieldOk,
  parsed,
  parseHmsField,
  parseNumberField,
  parseTimestampField,
  quickNumberField,
} from "@/lib/analysis/read/fast-fields";
import { parseHmsText, parseNumberText, parseTimestampText } from "@/lib/analysis/read/text-values";
import { createPrng } from "../support/sim";

const encoder = new TextEncoder();
const comma = 44;
const semicolon = 59;
const dot = 46;

function number(text: string, decimal = dot, delimiter = semicolon): { status: number; value: number } {
  const bytes = encoder.encode(text);
  const status = parseNumberField(bytes, 0, bytes.length, delimiter, decimal);
  const quick = quickNumberField(bytes, 0, bytes.length, delimiter, decimal);
  expect(quick).toBe(status);
  return { status, value: status === fieldOk ? parsed[0]! : Number.NaN };
}

function randomNumberText(prng: ReturnType<typeof createPrng>): string {
  const digits = (n: number) => Array.from({ length: n }, () => Math.floor(prng.next() * 10)).join("");
  const sign = prng.next() < 0.3 ? "-" : prng.next() < 0.05 ? "+" : "";
  const whole = digits(Math.floor(prng.next() * 8));
  const fraction = prng.next() < 0.8 ? `.${digits(1 + Math.floor(prng.next() * 12))}` : "";
  const exponent = prng.next() < 0.1 ? `e${prng.next() < 0.5 ? "-" : ""}${Math.floor(prng.next() * 30)}` : "";
  const body = whole + fraction;
  return sign + (body === "" || body === "." ? "0" : body) + exponent;
}

describe("byte number parser", () => {
  it("equals Number() on 20,000 random decimal strings, bit for bit", () => {
    // Number() is correctly rounded (ECMAScript StringToNumber); so must the parser be.
    const prng = createPrng(42);
    for (let k = 0; k < 20_000; k++) {
      const text = randomNumberText(prng);
      const got = number(text);
      expect(got.status, text).toBe(fieldOk);
      expect(Object.is(got.value, Number(text)), `${text}: ${got.value} vs ${Number(text)}`).toBe(true);
    }
  });

  it("takes long mantissas and large exponents through Number()", () => {
    for (const text of ["12345678901234567890.5", "1e300", "1.5e-300", "0.1234567890123456789", "-0"]) {
      expect(Object.is(number(text).value, Number(text)), text).toBe(true);
    }
  });

  it("reads a decimal comma as the same number", () => {
    for (const text of ["3.7012", "-0.000125", "4200", "1.5e3"]) {
      expect(number(text.replace(".", ","), comma).value).toBe(Number(text));
    }
  });

  it("tells empty cells from bad ones, as the text parser does", () => {
    expect(number("").status).toBe(fieldEmpty);
    expect(number("  ").status).toBe(fieldEmpty);
    expect(number('""').status).toBe(fieldEmpty);
    for (const bad of ["abc", "-", ".", "1.2.3", "3,7", "1e", "1e+", "NaN", "Infinity", "0x10", "3 .7", "4.2V"]) {
      expect(number(bad).status, bad).toBe(fieldBad);
      expect(Number.isNaN(parseNumberText(bad, ".")), bad).toBe(true);
    }
    expect(number("3.7", comma).status).toBe(fieldBad);
    expect(Number.isNaN(parseNumberText("3.7", ","))).toBe(true);
  });

  it("reads quoted and padded cells and stops at the delimiter", () => {
    expect(number('"3.5"').value).toBe(3.5);
    expect(number(' "  -2.25 " ').value).toBe(-2.25);
    const bytes = encoder.encode("1.5;2.5");
    expect(parseNumberField(bytes, 0, bytes.length, semicolon, dot)).toBe(fieldOk);
    expect(parsed[0]).toBe(1.5);
  });
});

describe("calendar arithmetic", () => {
  it("agrees with Date.UTC from 1900 to 2100", () => {
    for (let year = 1900; year <= 2100; year += 7)
      for (let month = 1; month <= 12; month++)
        for (const day of [1, 15, 28]) expect(daysFromCivil(year, month, day) * 86_400_000).toBe(Date.UTC(year, month - 1, day));
  });

  it("knows leap days (Gregorian rule)", () => {
    expect(validDate(2024, 2, 29)).toBe(true);
    expect(validDate(2023, 2, 29)).toBe(false);
    expect(validDate(1900, 2, 29)).toBe(false);
    expect(validDate(2000, 2, 29)).toBe(true);
    expect(validDate(2024, 4, 31)).toBe(false);
  });
});

function timestamp(text: string): { status: number; seconds: number } {
  const bytes = encoder.encode(text);
  const status = parseTimestampField(bytes, 0, bytes.length, comma);
  return { status, seconds: status === fieldOk ? parsed[0]! + parsed[1]! : Number.NaN };
}

describe("timestamps", () => {
  const cases = [
    "2024-03-05T10:00:00Z",
    "2024-03-05T10:00:00.250+01:00",
    "2024-03-05T10:00:00.250-05:30",
    "2024-12-31T23:59:59.999+0200",
    "2024-02-29T00:00:00+14:00",
    "1999-01-01T00:00:00.5-12:00",
  ];
  it("agree with Date.parse for ISO 8601 with offsets", () => {
    for (const text of cases) {
      expect(timestamp(text).seconds * 1000, text).toBeCloseTo(Date.parse(text), 6);
      const t = parseTimestampText(text)!;
      expect((t.whole + t.frac) * 1000, text).toBeCloseTo(Date.parse(text), 6);
    }
  });

  it("read the space-separated form without offset as UTC", () => {
    expect(timestamp("2024-03-05 10:00:00.125").seconds).toBe(Date.UTC(2024, 2, 5, 10, 0, 0, 125) / 1000);
    expect(timestamp("2024/03/05 10:00").seconds).toBe(Date.UTC(2024, 2, 5, 10, 0, 0) / 1000);
  });

  it("give the byte and the text parser the same parts", () => {
    for (const text of [...cases, "2024-03-05 10:00:00,5", "2024-03-05 10:00:00 +01:00"]) {
      const bytes = encoder.encode(text);
      expect(parseTimestampField(bytes, 0, bytes.length, semicolon), text).toBe(fieldOk);
      const t = parseTimestampText(text)!;
      expect([parsed[0], parsed[1]], text).toEqual([t.whole, t.frac]);
    }
  });

  it("reject impossible dates and malformed offsets", () => {
    for (const bad of ["2023-02-29 10:00:00", "2024-13-01 10:00:00", "2024-01-01 24:00:00", "2024-01-01 10:61:00", "2024-01-01T10:00:00+01:", "2024-01-01T10:00:00+1", "2024-01-01", "10:00:00"]) {
      expect(timestamp(bad).status, bad).toBe(fieldBad);
      expect(parseTimestampText(bad), bad).toBeNull();
    }
  });
});

describe("elapsed hh:mm:ss", () => {
  it("reads hours past 24 and fractions, in both parsers alike", () => {
    const cases: [string, number][] = [
      ["0:00:00", 0],
      ["1:02:03", 3723],
      ["27:46:40.5", 100_000.5],
      ["100:00:00.125", 360_000.125],
      ["0:00:01,25", 1.25],
    ];
    for (const [text, seconds] of cases) {
      const bytes = encoder.encode(text);
      expect(parseHmsField(bytes, 0, bytes.length, semicolon), text).toBe(fieldOk);
      expect(parsed[0], text).toBe(seconds);
      expect(parseHmsText(text), text).toBe(seconds);
    }
  });

  it("rejects minutes or seconds of 60 and other forms", () => {
    for (const bad of ["1:60:00", "1:00:60", "1:00", "a:00:00", "1:00:00.", "-1:00:00"]) {
      const bytes = encoder.encode(bad);
      expect(parseHmsField(bytes, 0, bytes.length, semicolon), bad).toBe(fieldBad);
      expect(Number.isNaN(parseHmsText(bad)), bad).toBe(true);
    }
  });
});
