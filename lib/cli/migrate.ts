// npm run db:migrate — applies pending migrations in drizzle/ (opening the database applies them).
import { runMain, withDatabase } from "./with-database";

runMain(async () => {
  await withDatabase(async () => undefined);
  console.log("Migrations are up to date.");
});
