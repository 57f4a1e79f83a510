// npm run db:seed — seeds the demo scenario into an empty database.
import { seedDemo } from "@/lib/db/seed";
import { runMain, withDatabase } from "./with-database";

runMain(async () => {
  const result = await withDatabase(seedDemo);
  console.log(result.seeded ? `Seeded the demo: ${result.users} users, ${result.cells} cells.` : "The database has users already; nothing seeded.");
});
