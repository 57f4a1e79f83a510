/**
 * Writes the demo scenario's bench logs into public/demo-logs/: invented tests of invented cells
 * of Larkspur Pack Works, simulated with our Thevenin cell model (tests/support/sim). They are
 * demo data only; no test takes its expected values from these files.
 *
 * Run: npx tsx tests/support/demo/make-demo-logs.ts
 * The logs are written in several bench-instrument styles on purpose, so the demo shows column
 * detection at work: a German-language logger with decimal commas, a plain English export with
 * elapsed hh:mm:ss, and a logger that writes milliamperes with a mode column.
 */
import fs from "node:fs";
import path from "node:path";
import { createPrng, protocol, simulate, type SampledSeries } from "../sim";
import { demoCapacityFactors, demoFadingSerial, demoLots } from "./scenario";

const outDir = path.join(process.cwd(), "public", "demo-logs");

function writeLog(name: string, text: string): void {
  fs.writeFileSync(path.join(outDir, name), text);
  console.log(`${name}: ${(text.length / 1024).toFixed(0)} KiB`);
}

/** Semicolon-separated, decimal commas, a metadata preamble: how many European loggers export. */
function germanStyle(s: SampledSeries, serial: string): string {
  const lines = [`Gerät;Demo-Logger 4`, `Kanal;2`, `Prüfling;${serial}`, `Start;2026-11-20 08:15:00`, ``, `Zeit [s];Spannung [V];Strom [mA];Temperatur [°C]`];
  const c = (x: number, d: number) => x.toFixed(d).replace(".", ",");
  for (let j = 0; j < s.length; j++) lines.push(`${c(s.t[j] ?? 0, 1)};${c(s.v[j] ?? 0, 4)};${c((s.i[j] ?? 0) * 1000, 1)};${c(s.temp?.[j] ?? 23, 2)}`);
  return lines.join("\r\n") + "\r\n";
}

function hms(t: number): string {
  const whole = Math.round(t);
  const h = Math.floor(whole / 3600);
  const m = Math.floor((whole % 3600) / 60);
  const sec = whole % 60;
  return `${String(h).padStart(2, "0")}:${String(m).padStart(2, "0")}:${String(sec).padStart(2, "0")}`;
}

/** Comma-separated, elapsed seconds with decimals, for fast logging. */
function fastStyle(s: SampledSeries): string {
  const lines = ["Time (s),Voltage (V),Current (A)"];
  for (let j = 0; j < s.length; j++) lines.push(`${(s.t[j] ?? 0).toFixed(2)},${(s.v[j] ?? 0).toFixed(4)},${(s.i[j] ?? 0).toFixed(4)}`);
  return lines.join("\n") + "\n";
}

/** Comma-separated, elapsed hh:mm:ss, signed current in amperes. */
function plainStyle(s: SampledSeries): string {
  const lines = ["Record,Elapsed Time,Voltage(V),Current(A),Cell Temp(C)"];
  for (let j = 0; j < s.length; j++) lines.push(`${j + 1},${hms(s.t[j] ?? 0)},${(s.v[j] ?? 0).toFixed(4)},${(s.i[j] ?? 0).toFixed(4)},${(s.temp?.[j] ?? 23).toFixed(1)}`);
  return lines.join("\n") + "\n";
}

/** Tab-separated, unsigned milliamperes plus a mode column, with the step and cycle counters a cycler writes. */
function cyclerStyle(s: SampledSeries): string {
  const lines = ["time_s\tmode\tcycle\tstep\tvoltage_V\tcurrent_mA"];
  for (let j = 0; j < s.length; j++) {
    const i = s.i[j] ?? 0;
    const mode = Math.abs(i) < 0.005 ? "rest" : i > 0 ? "charge" : "discharge";
    lines.push(`${(s.t[j] ?? 0).toFixed(0)}\t${mode}\t${s.cycle[j]}\t${s.step[j]}\t${(s.v[j] ?? 0).toFixed(4)}\t${Math.abs(i * 1000).toFixed(1)}`);
  }
  return lines.join("\n") + "\n";
}

function capacityCheck(seed: number, capacityFactor: number, interval: number): SampledSeries {
  const plan = protocol().ccDischarge(0.2, 3.0).rest(1800).ccCvCharge(0.5, 4.2, 0.05).rest(1800).ccDischarge(0.2, 3.0).build();
  return simulate(plan, {
    ratedCapacity_mAh: 1000 * capacityFactor,
    initialSoc: 0.45,
    logInterval_s: interval,
    voltageNoise_V: 0.002,
    currentNoise_A: 0.002,
    seed,
  }).samples;
}

function main(): void {
  fs.mkdirSync(outDir, { recursive: true });
  // Two capacity checks the README's walkthrough uploads by hand.
  writeLog("PB-0007-capacity-check.csv", germanStyle(capacityCheck(7, demoCapacityFactors["PB-0007"] ?? 1, 10), "PB-0007"));
  writeLog("PB-0012-capacity-check.csv", plainStyle(capacityCheck(12, demoCapacityFactors["PB-0012"] ?? 1, 10)));

  // A cycle-life test of a cell that fades fast: 1C charge and discharge, 0.4 % of rated lost per cycle, past the 80 % end of life.
  const life = protocol()
    .repeat(75, (b) => b.ccCvCharge(1, 4.2, 0.05).rest(600).ccDischarge(1, 3.0).rest(600))
    .build();
  const fading = simulate(life, { ratedCapacity_mAh: 1000, initialSoc: 0.02, fadePerCycle: 0.004, logInterval_s: 30, voltageNoise_V: 0.002, currentNoise_A: 0.003, seed: 19 });
  writeLog(`${demoFadingSerial}-cycle-life.tsv`, cyclerStyle(fading.samples));

  // The IEC 61960-3 DC resistance sequence on a charged, rested cell, logged at 5 Hz.
  const dcir = protocol().rest(300).pulse(-0.2, 10).pulse(-1, 1).rest(120).build();
  writeLog("PA-0003-internal-resistance.csv", fastStyle(simulate(dcir, { ratedCapacity_mAh: 1000, initialSoc: 0.97, logInterval_s: 0.2, seed: 3 }).samples));

  // Every cell of two lots gets an incoming capacity check, logged once a minute.
  for (const lot of demoLots) {
    const dir = path.join(outDir, `lot-${lot.prefix}`);
    fs.mkdirSync(dir, { recursive: true });
    const prng = createPrng(lot.seed);
    for (let n = 1; n <= lot.cells; n++) {
      const serial = `${lot.prefix}-${String(n).padStart(4, "0")}`;
      const low = "lowCell" in lot && lot.lowCell.serial === serial ? lot.lowCell.factor : null;
      const factor = low ?? lot.meanFactor + lot.sdFactor * prng.normal();
      fs.writeFileSync(path.join(dir, `${serial}-incoming-capacity.csv`), plainStyle(capacityCheck(lot.seed + n, factor, 60)));
    }
    console.log(`lot-${lot.prefix}: ${lot.cells} capacity checks`);
  }

  // A log whose clock jumped back: the upload must refuse it with the line.
  const broken = plainStyle(capacityCheck(5, 1, 60)).split("\n");
  broken.splice(200, 1, broken[200]?.replace(/^(\d+),\d\d:\d\d:\d\d/, "$1,00:00:05") ?? "");
  writeLog("broken-clock-jump.csv", broken.join("\n"));
}

main();
