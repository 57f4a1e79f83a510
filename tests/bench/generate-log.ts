/**
 * Writes a long synthetic cycling log (CC charge, CV taper, rest, CC discharge, rest)
 * for the benchmark. The cell model is deliberately crude (linear-ish OCV plus a series
 * resistance): the benchmark measures throughput, not accuracy; accuracy is checked
 * against the simulator in tests/support/sim.
 */
import { createWriteStream } from "node:fs";
import { once } from "node:events";

export interface GeneratedLog {
  path: string;
  rows: number;
  bytes: number;
}

const capacityAs = 2 * 3600; // 2 Ah cell, in ampere-seconds
const resistance = 0.05; // ohms
const chargeCurrent = 1;
const dischargeCurrent = -1;
const vMax = 4.2; // charge limit, common practice, no source
const vMin = 3.0; // empty, common practice, no source
const cvEndCurrent = 0.05;
const restSeconds = 600;

function ocv(soc: number): number {
  // Reaches the 4.2 V limit (with the IR rise) before full, so the log cycles: CC, CV, rest, discharge.
  return 3.0 + 1.2 * soc + 0.1 * Math.tanh((soc - 0.1) * 12) * (1 - soc);
}

type Phase = "cc-charge" | "cv" | "rest-after-charge" | "discharge" | "rest-after-discharge";

/** Yields CSV text in pieces of roughly `pieceRows` rows. */
export function* generateLogText(rows: number, pieceRows = 20_000): Generator<string> {
  yield "Test Time (s),Voltage (V),Current (A)\n";
  let soc = 0.05;
  let phase: Phase = "cc-charge";
  let phaseStart = 0;
  let cvCurrent = chargeCurrent;
  let piece: string[] = [];
  for (let k = 0; k < rows; k++) {
    const t = k; // one row per second
    let i = 0;
    let v = ocv(soc);
    switch (phase) {
      case "cc-charge":
        i = chargeCurrent;
        v = ocv(soc) + resistance * i;
        if (v >= vMax) {
          phase = "cv";
          cvCurrent = i;
        }
        break;
      case "cv":
        v = vMax;
        cvCurrent = Math.max(0, (vMax - ocv(soc)) / resistance);
        i = cvCurrent;
        if (i < cvEndCurrent) {
          phase = "rest-after-charge";
          phaseStart = t;
        }
        break;
      case "rest-after-charge":
        if (t - phaseStart >= restSeconds) phase = "discharge";
        break;
      case "discharge":
        i = dischargeCurrent;
        v = ocv(soc) + resistance * i;
        if (v <= vMin) {
          phase = "rest-after-discharge";
          phaseStart = t;
        }
        break;
      case "rest-after-discharge":
        if (t - phaseStart >= restSeconds) phase = "cc-charge";
        break;
    }
    soc = Math.min(1, Math.max(0, soc + i / capacityAs));
    piece.push(`${t}.0,${v.toFixed(4)},${i.toFixed(4)}\n`);
    if (piece.length >= pieceRows) {
      yield piece.join("");
      piece = [];
    }
  }
  if (piece.length > 0) yield piece.join("");
}

export async function writeLog(path: string, rows: number): Promise<GeneratedLog> {
  const out = createWriteStream(path);
  let bytes = 0;
  for (const text of generateLogText(rows)) {
    bytes += Buffer.byteLength(text);
    if (!out.write(text)) await once(out, "drain");
  }
  out.end();
  await once(out, "finish");
  return { path, rows, bytes };
}
