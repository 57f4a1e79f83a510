import fs from "node:fs";
import path from "node:path";
import { closeDatabase, openDatabase, installDatabaseHandle, type DatabaseHandle } from "@/lib/db/client";
import { resetAuth } from "@/lib/auth/auth";
import { stopOutboxSender } from "@/lib/mail/sender";

/**
 * A fresh database for one test file: in-memory PGlite by default, or the PostgreSQL server named
 * by TEST_DATABASE_URL (CI runs the integration suite against both). On a server every table is
 * emptied first so files do not see each other's rows, and the rows the migrations themselves
 * insert (the starting flag rules) are put back, so the server starts each file as a fresh database.
 */
export async function installTestDatabase(): Promise<DatabaseHandle> {
  const url = process.env.TEST_DATABASE_URL;
  const handle = await openDatabase(url ? { kind: "postgres", url } : { kind: "pglite-memory" });
  if (url) {
    await handle.db.execute(
      // Truncating from the schema list keeps this in step with migrations automatically.
      `do $$ declare r record; begin
         for r in select tablename from pg_tables where schemaname = 'public' loop
           execute 'truncate table ' || quote_ident(r.tablename) || ' restart identity cascade';
         end loop; end $$;`,
    );
    for (const statement of migrationSeedRows()) await handle.db.execute(statement);
  }
  installDatabaseHandle(handle);
  resetAuth();
  return handle;
}

export async function removeTestDatabase(): Promise<void> {
  resetAuth();
  // The mail outbox's background sender reads the database on a timer: stop it before the database goes.
  await stopOutboxSender();
  await closeDatabase();
}

/** The INSERT statements of the migrations in drizzle/, in migration order. */
function migrationSeedRows(): string[] {
  const dir = path.join(process.cwd(), "drizzle");
  return fs
    .readdirSync(dir)
    .filter((name) => name.endsWith(".sql"))
    .sort()
    .flatMap((name) => fs.readFileSync(path.join(dir, name), "utf8").split("--> statement-breakpoint"))
    .map((statement) => statement.replace(/^\s*(--[^\n]*\n\s*)*/, "").trim())
    .filter((statement) => /^insert\s+into\s/i.test(statement));
}
