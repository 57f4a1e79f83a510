import { describe, expect, it } from "vitest";
import { summariseDcir } from "@/lib/notebook/dcir";
import { threadNotes } from "@/lib/notebook/notes";

describe("threadNotes", () => {
  const notes = [
    { id: 3, authorName: "B", at: "2026-11-20T10:00:00.000Z", text: "Correction: bench 4.", amends: 1 },
    { id: 1, authorName: "A", at: "2026-11-20T09:00:00.000Z", text: "Bench 3.", amends: null },
    { id: 2, authorName: "A", at: "2026-11-20T09:30:00.000Z", text: "Cell warm at the end.", amends: null },
    { id: 4, authorName: "C", at: "2026-11-20T11:00:00.000Z", text: "Second correction.", amends: 1 },
  ];

  it("keeps every note, oldest first, and names the notes that amend one", () => {
    const thread = threadNotes(notes);
    expect(thread.map((n) => n.id)).toEqual([1, 2, 3, 4]);
    expect(thread[0]).toMatchObject({ id: 1, text: "Bench 3.", amendedBy: [3, 4], amendsNote: null });
    expect(thread[1]?.amendedBy).toEqual([]);
    expect(thread[2]?.amendsNote).toMatchObject({ id: 1, text: "Bench 3." });
  });
});

describe("summariseDcir", () => {
  it("prefers the IEC 61960-3 two-current results and takes their median", () => {
    // IEC 61960-3 §7.7 (from memory, domain notes): R = (U1 − U2) / (I2 − I1).
    // (4.0599 − 4.0079) V / (1.0 − 0.2) A = 0.065 Ω = 65 mΩ.
    const iec = ((4.0599 - 4.0079) / (1.0 - 0.2)) * 1000;
    const summary = summariseDcir([
      { method: "step-edge", resistance_mOhm: 63 },
      { method: "IEC 61960-3 DC", resistance_mOhm: iec },
      { method: "IEC 61960-3 DC", resistance_mOhm: 200 },
      { method: "IEC 61960-3 DC", resistance_mOhm: 60 },
    ]);
    // The median of three values is the middle one (NIST/SEMATECH e-Handbook §1.3.5.1).
    expect(summary?.method).toBe("IEC 61960-3 DC");
    expect(summary?.medianMohm).toBeCloseTo(65, 9);
    expect(summary?.count).toBe(3);
  });

  it("falls back to step-edge estimates, and gives null without any result", () => {
    expect(summariseDcir([{ method: "step-edge", resistance_mOhm: 62 }, { method: "step-edge", resistance_mOhm: 64 }])).toEqual({ method: "step-edge", medianMohm: 63, count: 2 });
    expect(summariseDcir([{ method: "IEC 61960-3 DC", resistance_mOhm: null }])).toBeNull();
  });
});

describe("isSafetyFinding", () => {
  it("counts limit violations and anything rated dangerous, not a charge that stopped early", async () => {
    const { isSafetyFinding } = await import("@/lib/notebook/findings");
    // 4.2 V is the usual charge limit for polymer cells (common practice, no source): going past it is a limit finding.
    expect(isSafetyFinding({ kind: "over-voltage", severity: "danger" })).toBe(true);
    expect(isSafetyFinding({ kind: "charge-temperature", severity: "warning" })).toBe(true);
    expect(isSafetyFinding({ kind: "cv-not-terminated", severity: "warning" })).toBe(false);
    expect(isSafetyFinding({ kind: "logging-gap", severity: "danger" })).toBe(true);
    expect(isSafetyFinding({ kind: "logging-gap", severity: "info" })).toBe(false);
  });
});
