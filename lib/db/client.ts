import "server-only";
import path from "node:path";
import { PGlite } from "@electric-sql/pglite";
import type { PgDatabase, PgQueryResultHKT } from "drizzle-orm/pg-core";
import { drizzle as drizzlePglite } from "drizzle-orm/pglite";
import { migrate as migratePglite } from "drizzle-orm/pglite/migrator";
import { drizzle as drizzlePg } from "drizzle-orm/node-postgres";
import { migrate as migratePg } from "drizzle-orm/node-postgres/migrator";
import { Pool } from "pg";
import { serverEnv } from "@/lib/env";
import { lockDataDirectory, type DirectoryLock } from "./lock";
import * as schema from "./schema";

export type Database = PgDatabase<PgQueryResultHKT, typeof schema>;
export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];
/** Either the database or an open transaction: queries that may join a caller's transaction take this. */
export type Executor = Database | Transaction;

export type DatabaseTarget =
  | { kind: "pglite"; dataDir: string }
  | { kind: "pglite-memory" }
  | { kind: "postgres"; url: string };

export interface DatabaseHandle {
  db: Database;
  target: DatabaseTarget;
  close(): Promise<void>;
}

const migrationsFolder = path.join(process.cwd(), "drizzle");

/** Opens a database, takes the directory lock for PGlite, and applies pending migrations. */
export async function openDatabase(target: DatabaseTarget): Promise<DatabaseHandle> {
  if (target.kind === "postgres") {
    const pool = new Pool({ connectionString: target.url, max: 10 });
    const db = drizzlePg(pool, { schema });
    // Several app processes may share one server: serialise their migrations.
    const client = await pool.connect();
    try {
      await client.query("select pg_advisory_lock(727274)");
      await migratePg(db, { migrationsFolder });
    } finally {
      await client.query("select pg_advisory_unlock(727274)").catch(() => undefined);
      client.release();
    }
    return { db: db as unknown as Database, target, close: () => pool.end() };
  }

  let lock: DirectoryLock | null = null;
  let client: PGlite;
  if (target.kind === "pglite") {
    lock = lockDataDirectory(target.dataDir);
    try {
      client = await PGlite.create(target.dataDir);
    } catch (error) {
      lock.release();
      throw error;
    }
  } else {
    client = await PGlite.create();
  }
  const db = drizzlePglite(client, { schema });
  try {
    await migratePglite(db, { migrationsFolder });
  } catch (error) {
    await client.close().catch(() => undefined);
    lock?.release();
    throw error;
  }
  let closed = false;
  return {
    db: db as unknown as Database,
    target,
    async close() {
      if (closed) return;
      closed = true;
      try {
        await client.close();
      } finally {
        lock?.release();
      }
    },
  };
}

export function targetFromEnv(): DatabaseTarget {
  const env = serverEnv();
  if (env.DATABASE_URL) return { kind: "postgres", url: env.DATABASE_URL };
  // `next build` imports route modules to collect page data; it must never touch the real directory.
  if (process.env.NEXT_PHASE === "phase-production-build") return { kind: "pglite-memory" };
  return { kind: "pglite", dataDir: env.dataDir };
}

/*
 * One database per process. Next.js evaluates route handlers, pages and server actions as separate
 * module instances, so the handle lives on globalThis rather than in a module variable.
 */
interface GlobalDb {
  handle?: DatabaseHandle;
  opening?: Promise<DatabaseHandle>;
  signalsHooked?: boolean;
}
const globalKey = Symbol.for("kneepoint.db");
const store = ((globalThis as Record<symbol, unknown>)[globalKey] ??= {}) as GlobalDb;

function hookShutdown(): void {
  if (store.signalsHooked) return;
  store.signalsHooked = true;
  const shutdown = (signal: NodeJS.Signals) => {
    void closeDatabase()
      .catch((error: unknown) => console.error("Closing the database failed", error))
      .finally(() => process.exit(signal === "SIGINT" ? 130 : 0));
  };
  process.once("SIGTERM", shutdown);
  process.once("SIGINT", shutdown);
}

/** The process-wide database, opened (and migrated) on first use from the environment. */
export async function getDb(): Promise<Database> {
  if (store.handle) return store.handle.db;
  store.opening ??= openDatabase(targetFromEnv()).then(
    (handle) => {
      store.handle = handle;
      if (handle.target.kind !== "pglite-memory") hookShutdown();
      return handle;
    },
    (error: unknown) => {
      store.opening = undefined;
      throw error;
    },
  );
  return (await store.opening).db;
}

/**
 * Whether this process is the database's only user: PGlite is, by its directory lock (or being in
 * memory); a PostgreSQL server may have other app processes on it.
 */
export async function databaseIsExclusive(): Promise<boolean> {
  await getDb();
  return store.handle?.target.kind !== "postgres";
}

/** Installs an already open handle as the process database (tests and scripts). */
export function installDatabaseHandle(handle: DatabaseHandle): void {
  store.handle = handle;
  store.opening = Promise.resolve(handle);
}

export async function closeDatabase(): Promise<void> {
  const handle = store.handle;
  store.handle = undefined;
  store.opening = undefined;
  await handle?.close();
}
