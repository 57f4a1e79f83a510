/**
 * The analyze CLI, spawned as a user would run it: exit codes and the JSON on stdout.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { simulate, standardCycles, toCsv } from "@/tests/support/sim";

const dir = mkdtempSync(join(tmpdir(), "kneepoint-cli-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function cli(args: string[], viaNpm = false): { code: number | null; stdout: string; stderr: string } {
  const r = viaNpm
    ? spawnSync("npm", ["run", "-s", "analyze", "--", ...args], { encoding: "utf8", cwd: process.cwd() })
    : spawnSync(process.execPath, ["--import", "tsx", "lib/cli/analyze.ts", ...args], { encoding: "utf8", cwd: process.cwd() });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const sim = simulate(standardCycles(2), { ratedCapacity_mAh: 2000, voltageNoise_V: 0.002, currentNoise_A: 0.002, seed: 9 });
const good = join(dir, "two-cycles.csv");
writeFileSync(good, toCsv(sim.samples, { withStepColumn: true }));

describe("npm run analyze", () => {
  it("prints one JSON report and exits 0 for a good log", () => {
    const r = cli([good, "--rated-mah", "2000", "--chemistry", "lipo"], true);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout);
    expect(report.status).toBe("ok");
    expect(Object.keys(report.detected)).toEqual(expect.arrayContaining(["delimiter", "decimal", "time_format", "current_sign", "columns"]));
    expect(Object.keys(report.totals)).toEqual(expect.arrayContaining(["charged_mAh", "charged_Wh", "discharged_mAh", "discharged_Wh", "coulombic_efficiency"]));
    expect(report.cycles).toHaveLength(2);
    const c = report.cycles[1];
    expect(c.cycle).toBe(2);
    expect(Object.keys(c.charge)).toEqual(expect.arrayContaining(["start_s", "end_s", "mAh", "Wh", "cc", "cv", "transition"]));
    expect(typeof c.charge.cc.mAh).toBe("number");
    expect(typeof c.charge.cv.final_current_A).toBe("number");
    expect(Object.keys(c.charge.transition)).toEqual(expect.arrayContaining(["time_s", "voltage_V", "capacity_mAh"]));
    expect(Object.keys(c.discharge)).toEqual(expect.arrayContaining(["start_s", "end_s", "mAh", "Wh"]));
    expect(typeof c.coulombic_efficiency).toBe("number");
    expect(report.per_cycle_discharge_mAh).toHaveLength(2);
    const truth = sim.truth.cycles[1]?.discharge?.mAh ?? NaN;
    expect(Math.abs(report.per_cycle_discharge_mAh[1] - truth) / truth).toBeLessThan(0.005);
    for (const key of ["steps", "findings", "dcir"]) expect(Array.isArray(report[key])).toBe(true);
    // --chemistry lipo: 4.2 V charge limit, 3.0 V empty, 3.7 V nominal (common practice, no source).
    expect(report.limits_used).toMatchObject({ chargeVoltageLimit_V: 4.2, dischargeCutoff_V: 3.0, nominalVoltage_V: 3.7, ratedCapacity_mAh: 2000 });
    // The log's step column is respected (CC-CV split inside is ours).
    expect(report.steps[0].logged_step).toBe(1);
  });

  it("rejects a log with a located error: exit 2, JSON on stdout, a message on stderr", () => {
    const bad = join(dir, "bad.csv");
    writeFileSync(bad, "time_s,voltage_V,current_A\n0,3.70,1\n1,3.71,1\n2,x.yz,1\n3,3.72,1\n");
    const r = cli([bad]);
    expect(r.code).toBe(2);
    const out = JSON.parse(r.stdout);
    expect(out).toMatchObject({ status: "reject", line: 4 });
    expect(typeof out.reason).toBe("string");
    expect(r.stderr).toMatch(/line 4/);
  });

  it("takes a column map for headings it cannot read, with current in mA", () => {
    const odd = join(dir, "odd.csv");
    writeFileSync(odd, toCsv(sim.samples, { currentIn_mA: true }).replace(/^[^\n]*/, "a,b,c,d"));
    const map = join(dir, "map.json");
    writeFileSync(map, JSON.stringify({ time: { index: 0 }, voltage: { index: 1 }, current: { index: 2, unit: "mA" }, temperature: { index: 3 } }));
    const r = cli([odd, "--map", map, "--rated-mah", "2000"]);
    expect(r.code).toBe(0);
    const report = JSON.parse(r.stdout);
    const truth = sim.truth.totals.discharged_mAh;
    expect(Math.abs(report.totals.discharged_mAh - truth) / truth).toBeLessThan(0.005);
    const unmapped = cli([odd]);
    expect(unmapped.code).toBe(2);
  });

  it("exits 1 with a message for bad arguments", () => {
    const r = cli([good, "--chemistry", "unobtainium"]);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/chemistry/);
    expect(r.stdout).toBe("");
    expect(cli([]).code).toBe(1);
  });
});
