/**
 * Prepares a data directory before the app starts on it: migrations, the demo's users and cells
 * (without its runs), and a personal API token for the demo technician, printed with a few cell
 * serials as JSON on the last line. It runs before the server because a PGlite directory has one process at a time.
 * Usage: KNEEPOINT_DATA_DIR=<dir> tsx --conditions=react-server tests/e2e/support/prepare-data-root.ts
 */
import { asc, eq } from "drizzle-orm";
import { newApiToken } from "@/lib/auth/api-token";
import { runMain, withDatabase } from "@/lib/cli/with-database";
import { insertApiToken } from "@/lib/db/queries/api-tokens";
import { cell, user } from "@/lib/db/schema";
import { seedDemo } from "@/lib/db/seed";
import { demoUsers } from "@/lib/db/seed-users";

runMain(async () => {
  const prepared = await withDatabase(async (db) => {
    await seedDemo(db);
    const technician = demoUsers.find((u) => u.role === "technician");
    if (!technician) throw new Error("no demo technician");
    const [owner] = await db.select({ id: user.id, name: user.name }).from(user).where(eq(user.email, technician.email));
    if (!owner) throw new Error("the demo technician was not seeded");
    const created = newApiToken();
    await insertApiToken({ name: "robustness tests", tokenHash: created.tokenHash, prefix: created.prefix }, owner);
    const serials = (await db.select({ serial: cell.serial }).from(cell).orderBy(asc(cell.serial)).limit(8)).map((c) => c.serial);
    return { token: created.token, serials };
  });
  process.stdout.write(`${JSON.stringify(prepared)}\n`);
});
