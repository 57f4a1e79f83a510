import { defineConfig } from "drizzle-kit";

// Only `drizzle-kit generate` is used: it reads the schema and writes SQL into drizzle/.
// Migrations are applied by the app itself (lib/db/migrate.ts), never by drizzle-kit against a
// live data directory, because a second process on a PGlite directory silently loses rows.
export default defineConfig({
  dialect: "postgresql",
  schema: "./lib/db/schema.ts",
  out: "./drizzle",
  strict: true,
  verbose: true,
});
