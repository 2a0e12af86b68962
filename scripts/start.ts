// `npm start`: services up, migrations, demo seed on an empty database, a build when the sources
// changed since the last one, then the app on http://127.0.0.1:PORT. Ctrl-C stops what it started.
import { env } from "@/lib/env";
import { createDb } from "@/db/client";
import { migrate } from "@/db/migrate";
import { seedDemoIfEmpty } from "@/db/seed/index";
import { DEMO_PASSWORD, DEMO_USERS } from "@/db/seed/demo-users";
import { build, buildIsStale } from "./build-state";
import { serviceConfig, startApp, startServices, stopAll, type StartedService } from "./services";

async function main() {
  const cfg = serviceConfig(env);
  const services: StartedService[] = [];
  let stopping = false;
  const shutdown = async (code: number) => {
    if (stopping) return;
    stopping = true;
    console.log("\nStopping Trenchbook…");
    await stopAll(services);
    process.exit(code);
  };
  process.on("SIGINT", () => void shutdown(0));
  process.on("SIGTERM", () => void shutdown(0));

  try {
    services.push(...(await startServices(cfg)));
    // Migrations as the owner role, the seed (rows only) as the app's role (scripts/services.ts).
    const ownerDb = createDb(env.MIGRATION_DATABASE_URL, 2);
    try {
      await migrate(ownerDb);
    } finally {
      await ownerDb.destroy();
    }
    const db = createDb(env.DATABASE_URL, 2);
    try {
      const seeded = await seedDemoIfEmpty(db);
      console.log(seeded ? "Seeded the demo scenario." : "Database already has data; seed skipped.");
    } finally {
      await db.destroy();
    }
    const childEnv = {
      ...process.env,
      NEXTAUTH_URL: process.env.NEXTAUTH_URL ?? env.APP_URL,
      NEXT_TELEMETRY_DISABLED: "1",
    };
    if (buildIsStale()) build(childEnv);
    services.push(await startApp(env.PORT, { ...childEnv, NODE_ENV: "production" }, null));
  } catch (err) {
    console.error(`\n${err instanceof Error ? err.message : String(err)}`);
    await shutdown(1);
    return;
  }

  const mail = services.find((s) => s.name === "SMTP fake");
  const s3 = services.find((s) => s.name === "S3 fake");
  console.log(`
Trenchbook is running.
  app          ${env.APP_URL}
  health       ${env.APP_URL}/api/health
  mail inbox   ${mail?.url} (SMTP on 127.0.0.1:${env.SMTP_PORT})
  S3 fake      ${s3?.url} (bucket ${env.S3_BUCKET})
  PostgreSQL   127.0.0.1:${cfg.pgPort} database ${cfg.dbName}

Demo sign-ins (password "${DEMO_PASSWORD}"):
${DEMO_USERS.map((u) => `  ${u.role.padEnd(11)} ${u.email}`).join("\n")}

Press Ctrl-C to stop.`);
}

void main();
