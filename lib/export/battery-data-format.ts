/**
 * A run's samples as a Battery Data Format (BDF) time-series table, written batch by batch so a
 * long log never has to be held in memory.
 *
 * Labels and units are the "Preferred Label" column of the BDF README (Battery Data Alliance,
 * github.com/battery-data-alliance/battery-data-format, README.md "Defining the BDF for Cycler
 * Time-Series Data"): one header row of "Quantity / unit" labels, fixed units, every row as many
 * cells as the header.
 *
 * Current sign: the README gives no sign rule in words. The Alliance's reference package derives
 * `Charging Capacity / Ah` from the positive part of `Current / A` and `Discharging Capacity / Ah`
 * from the negative part (src/bdf/derive.py, `i_pos = np.maximum(i, 0.0)`), so a BDF file carries
 * current positive while charging. That is also Kneepoint's convention after the reader, so the
 * current is written unchanged. A reader can check it in any exported file: `Charging Capacity /
 * Ah` grows exactly where `Current / A` is positive.
 *
 * Pure TypeScript: no Node imports, so it runs in a route, a worker or the tests alike.
 */
import type { SampleBatch } from "@/lib/analysis/types";

export const bdfLabels = {
  testTime: "Test Time / s",
  voltage: "Voltage / V",
  current: "Current / A",
  unixTime: "Unix Time / s",
  cycleCount: "Cycle Count / 1",
  stepCount: "Step Count / 1",
  ambientTemperature: "Ambient Temperature / degC",
  surfaceTemperature: "Surface Temperature T1 / degC",
  chargingCapacity: "Charging Capacity / Ah",
  dischargingCapacity: "Discharging Capacity / Ah",
} as const;

export interface BdfWriterOptions {
  /** Seconds since 1970-01-01 UTC of the log's first data row, when the log states an absolute time; else Unix Time is left out. */
  startUnixS?: number | null;
  /** The run's recorded ambient temperature, written as a constant column when known. */
  ambientTempC?: number | null;
}

export interface BdfWriter {
  /** CSV text for one batch; the first call also returns the header row. */
  write(batch: SampleBatch): string;
  /** Whatever is still owed: the header alone when no batch ever came. */
  end(): string;
}

// Decimal places written. Test time to the microsecond keeps sub-millisecond logging intact;
// voltage and current to 1 µV / 1 µA are finer than bench instruments resolve; capacity to 1 nAh
// keeps a 0.1 % comparison of even a 1 mAh run meaningful.
const places = { time: 6, volt: 6, amp: 6, degC: 3, ah: 9, count: 0 } as const;

/** Fixed decimals with trailing zeros dropped; empty for a missing (NaN) value. */
function num(x: number, digits: number): string {
  if (!Number.isFinite(x)) return "";
  const text = x.toFixed(digits);
  if (digits === 0) return text === "-0" ? "0" : text;
  const trimmed = text.replace(/\.?0+$/, "");
  return trimmed === "-0" ? "0" : trimmed;
}

interface Layout {
  unix: boolean;
  cycle: boolean;
  step: boolean;
  ambient: boolean;
  surface: boolean;
}

function headerOf(layout: Layout): string {
  const labels: string[] = [bdfLabels.testTime, bdfLabels.voltage, bdfLabels.current];
  if (layout.unix) labels.push(bdfLabels.unixTime);
  if (layout.cycle) labels.push(bdfLabels.cycleCount);
  if (layout.step) labels.push(bdfLabels.stepCount);
  if (layout.ambient) labels.push(bdfLabels.ambientTemperature);
  if (layout.surface) labels.push(bdfLabels.surfaceTemperature);
  labels.push(bdfLabels.chargingCapacity, bdfLabels.dischargingCapacity);
  return labels.join(",") + "\n";
}

export function createBdfWriter(options: BdfWriterOptions = {}): BdfWriter {
  const startUnixS = options.startUnixS ?? null;
  const ambient = options.ambientTempC ?? null;
  const ambientText = ambient === null ? "" : num(ambient, places.degC);
  let layout: Layout | null = null;
  // Running state carried across batches.
  let prevT = NaN;
  let prevI = NaN;
  let chargedAs = 0;
  let dischargedAs = 0;
  // BDF's Step Count is "monotonically increasing"; a log's step column often restarts each cycle
  // (program step numbers), so every change of the logged value counts as a new step.
  let stepCount = 0;
  let lastLoggedStep = NaN;

  function layoutOf(batch: SampleBatch): Layout {
    return { unix: startUnixS !== null, cycle: batch.cycle !== null, step: batch.step !== null, ambient: ambient !== null, surface: batch.temp !== null };
  }

  return {
    write(batch) {
      let out = "";
      if (layout === null) {
        layout = layoutOf(batch);
        out = headerOf(layout);
      }
      const { t, v, i, temp, step, cycle } = batch;
      const rows: string[] = [];
      for (let k = 0; k < batch.length; k++) {
        const tk = t[k]!;
        const ik = i[k]!;
        if (Number.isFinite(prevT) && tk > prevT) {
          // Trapezoids over the positive and negative parts of the current, as the reference
          // package's derive.py does; A·s / 3600 = Ah (mAh = A·s/3.6, domain notes).
          const dt = tk - prevT;
          chargedAs += 0.5 * (Math.max(prevI, 0) + Math.max(ik, 0)) * dt;
          dischargedAs += 0.5 * (Math.max(-prevI, 0) + Math.max(-ik, 0)) * dt;
        }
        prevT = tk;
        prevI = ik;
        const cells = [num(tk, places.time), num(v[k]!, places.volt), num(ik, places.amp)];
        if (layout.unix && startUnixS !== null) cells.push(num(startUnixS + tk, places.time));
        if (layout.cycle) cells.push(cycle ? num(cycle[k]!, places.count) : "");
        if (layout.step) {
          const logged = step ? step[k]! : NaN;
          if (Number.isFinite(logged) && logged !== lastLoggedStep) {
            stepCount++;
            lastLoggedStep = logged;
          }
          cells.push(Number.isFinite(logged) ? String(stepCount) : "");
        }
        if (layout.ambient) cells.push(ambientText);
        if (layout.surface) cells.push(temp ? num(temp[k]!, places.degC) : "");
        cells.push(num(chargedAs / 3600, places.ah), num(dischargedAs / 3600, places.ah));
        rows.push(cells.join(","));
      }
      return rows.length > 0 ? out + rows.join("\n") + "\n" : out;
    },
    end() {
      if (layout !== null) return "";
      layout = { unix: startUnixS !== null, cycle: false, step: false, ambient: ambient !== null, surface: false };
      return headerOf(layout);
    },
  };
}

/** "<serial>-<name without its text extension>.bdf.csv", the README's ".bdf" infix before the serialisation's extension. */
export function bdfFileName(serial: string, fileName: string): string {
  const stem = fileName.replace(/(?:\.bdf)?\.(?:csv|tsv|txt|dat)$/i, "");
  return `${serial}-${stem}.bdf.csv`;
}
