import { closeDatabase, openDatabase, targetFromEnv, installDatabaseHandle, type Database } from "@/lib/db/client";

/**
 * Runs a command-line task against the configured database, holding the directory lock for the
 * task's duration, and always closes it (a PGlite left open loses its last writes).
 */
export async function withDatabase<T>(task: (db: Database) => Promise<T>): Promise<T> {
  const handle = await openDatabase(targetFromEnv());
  installDatabaseHandle(handle);
  try {
    return await task(handle.db);
  } finally {
    await closeDatabase();
  }
}

export function runMain(main: () => Promise<void>): void {
  main().then(
    () => process.exit(0),
    (error: unknown) => {
      console.error(error instanceof Error ? error.message : error);
      process.exit(1);
    },
  );
}
