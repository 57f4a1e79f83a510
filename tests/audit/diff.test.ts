import { describe, expect, it } from "vitest";
import { diffAuditValues, formatAuditValue } from "@/lib/audit/diff";

describe("diffAuditValues", () => {
  it("lists a changed field with its old and new value", () => {
    expect(diffAuditValues({ role: "technician" }, { role: "engineer" })).toEqual([
      { field: "role", kind: "changed", before: "technician", after: "engineer" },
    ]);
  });

  it("lists every field of a created record as added, and of a removed record as removed", () => {
    expect(diffAuditValues(null, { serial: "KP-1", quantity: 10, open: false })).toEqual([
      { field: "serial", kind: "added", before: null, after: "KP-1" },
      { field: "quantity", kind: "added", before: null, after: "10" },
      { field: "open", kind: "added", before: null, after: "false" },
    ]);
    expect(diffAuditValues({ name: "Old" }, null)).toEqual([{ field: "name", kind: "removed", before: "Old", after: null }]);
  });

  it("leaves unchanged fields out and follows nested objects by dotted path", () => {
    const before = { status: "queued", columnMap: { voltage: "U", current: "I" }, tags: ["a"] };
    const after = { status: "analysing", columnMap: { voltage: "U", current: "Amps", temperature: "T" }, tags: ["a", "b"] };
    expect(diffAuditValues(before, after)).toEqual([
      { field: "status", kind: "changed", before: "queued", after: "analysing" },
      { field: "columnMap.current", kind: "changed", before: "I", after: "Amps" },
      { field: "tags", kind: "changed", before: '["a"]', after: '["a","b"]' },
      { field: "columnMap.temperature", kind: "added", before: null, after: "T" },
    ]);
  });

  it("tells a null from a missing field and reads empty values as 'empty'", () => {
    expect(diffAuditValues({ capacityUslMah: 1050 }, { capacityUslMah: null })).toEqual([
      { field: "capacityUslMah", kind: "changed", before: "1050", after: "empty" },
    ]);
    expect(formatAuditValue("")).toBe("empty");
    expect(diffAuditValues(undefined, "a bare value")).toEqual([{ field: "value", kind: "added", before: null, after: "a bare value" }]);
    expect(diffAuditValues({ a: 1 }, { a: 1 })).toEqual([]);
  });
});
