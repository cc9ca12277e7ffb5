// Database command line: `tsx scripts/db.ts migrate|seed`.
import { connectDb, closeDb } from "../db/index";
import { migrateUp } from "../db/migrate";
import { seedDemoAccounts } from "../db/seeders/demo";
import { parseEnv } from "../app/utils/env.server";
import { seedDemoData } from "../app/services/demo-data.server";
import { seedDemoApiKey } from "../app/services/api-keys.server";
import { User } from "../db/models";
import { closeWorkerPool } from "../app/utils/worker-pool.server";

const env = parseEnv(process.env);
const command = process.argv[2];
const sequelize = connectDb(env);

try {
  if (command === "migrate") {
    const applied = await migrateUp(sequelize);
    console.log(applied.length ? `[db] migrations applied: ${applied.join(", ")}` : "[db] schema up to date");
  } else if (command === "seed") {
    // The demo seed runs on a developer's machine (npm start / npm test), never in a deployment.
    if (env.NODE_ENV === "production" && !env.DUSKLINE_LOCAL) {
      console.log("[db] demo seed skipped in production");
    } else {
      const org = await seedDemoAccounts(sequelize);
      if (org) await seedDemoData(org);
      // The local demo key (every scope); its secret is DEMO_API_KEY, default dl_demo_local_only_key.
      // Also on a database seeded before the key existed: the demo admin's organisation gets it once.
      const admin = await User.findOne({ where: org ? { organisationId: org.id, role: "admin" } : { email: "admin@example.com", role: "admin" } });
      if (admin && env.DUSKLINE_LOCAL) await seedDemoApiKey(sequelize, admin.organisationId, admin.id, env.DEMO_API_KEY);
      console.log(org ? "[db] demo data seeded" : "[db] database already has data; demo seed skipped");
    }
  } else {
    console.error("usage: tsx scripts/db.ts migrate|seed");
    process.exitCode = 2;
  }
} catch (err) {
  console.error(`[db] ${command} failed:`, err instanceof Error ? err.message : err);
  process.exitCode = 1;
} finally {
  // The demo studies ran on the engine's worker threads.
  await closeWorkerPool();
  await closeDb();
}
