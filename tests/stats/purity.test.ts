import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";

// The statistics library must stay pure TypeScript that runs in the browser and the server alike:
// it may import only its own modules and the two numeric packages (project rule for lib/stats).
const DIR = join(process.cwd(), "lib/stats");
const ALLOWED = new Set(["simple-statistics", "jstat"]);

describe("lib/stats imports", () => {
  const files = readdirSync(DIR).filter((f) => f.endsWith(".ts") && !f.endsWith(".d.ts"));

  it("has modules to check", () => {
    expect(files.length).toBeGreaterThan(5);
  });

  it.each(files)("%s imports only relative modules, simple-statistics and jstat", (file) => {
    const source = readFileSync(join(DIR, file), "utf8");
    // `from "x"`, bare `import "x"` and dynamic `import("x")`.
    const specifiers = [...source.matchAll(/(?:\bfrom\s+|^\s*import\s+|\bimport\(\s*)"([^"]+)"/gm)].map((m) => m[1] as string);
    const foreign = specifiers.filter((s) => !s.startsWith("./") && !ALLOWED.has(s));
    expect(foreign).toEqual([]);
  });
});
