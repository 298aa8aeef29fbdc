// `npm run demo`: migrate, load the demo farm, build, then serve the app with the local mail catcher.
// Everything runs on the embedded SQLite default (data/rimebook.sqlite) unless DATABASE_URL says otherwise.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import webpush from "web-push";
import { demoFarm, demoMembers } from "../db/seeds/data/demo-farm";
import { waitForApp } from "./wait-for-app";

const port = process.env.PORT ?? "3000";
fs.mkdirSync("data", { recursive: true });

// A demo still needs a real secret: make one once and keep it with the demo data.
const secretFile = path.join("data", ".session-secret");
if (!process.env.SESSION_SECRET) {
  if (!fs.existsSync(secretFile)) fs.writeFileSync(secretFile, randomBytes(32).toString("hex"), { mode: 0o600 });
  process.env.SESSION_SECRET = fs.readFileSync(secretFile, "utf8").trim();
}
// The same for the scheduler's digest secret (a production server without one switches the route off).
const cronFile = path.join("data", ".cron-secret");
if (!process.env.CRON_SECRET) {
  if (!fs.existsSync(cronFile)) fs.writeFileSync(cronFile, randomBytes(24).toString("hex"), { mode: 0o600 });
  process.env.CRON_SECRET = fs.readFileSync(cronFile, "utf8").trim();
}
// Phone reminders need a VAPID key pair (RFC 8292): make one once and keep it with the demo data too.
// Phones subscribe with the public key, so a new pair would silently orphan every reminder.
const vapidFile = path.join("data", ".vapid-keys.json");
if (!process.env.VAPID_PUBLIC_KEY && !process.env.VAPID_PRIVATE_KEY) {
  if (!fs.existsSync(vapidFile)) fs.writeFileSync(vapidFile, JSON.stringify(webpush.generateVAPIDKeys()), { mode: 0o600 });
  const pair = JSON.parse(fs.readFileSync(vapidFile, "utf8")) as { publicKey: string; privateKey: string };
  process.env.VAPID_PUBLIC_KEY = pair.publicKey;
  process.env.VAPID_PRIVATE_KEY = pair.privateKey;
}
process.env.APP_ORIGIN ??= `http://localhost:${port}`;
// The demo asks for the local mailbox page (every reset and invite link, for this computer only).
process.env.MAILBOX_PAGE ??= "on";
process.env.NEXT_TELEMETRY_DISABLED = "1";

function run(label: string, cmd: string, args: string[]) {
  console.log(`\n▸ ${label}`);
  const r = spawnSync(cmd, args, { stdio: "inherit", env: process.env });
  if (r.status !== 0) {
    console.error(`✗ ${label} failed (exit ${r.status}).`);
    process.exit(r.status ?? 1);
  }
}

run("Applying database migrations", "npm", ["run", "--silent", "db:migrate"]);
run("Loading the demo farm (Bramblewick Native Nursery)", "npm", ["run", "--silent", "db:seed"]);
if (process.env.DEMO_SKIP_BUILD !== "1") run("Building the app", "npm", ["run", "--silent", "build"]);

const children: ChildProcess[] = [];
if (fs.existsSync("scripts/mail-fake.ts")) {
  children.push(spawn("node", ["node_modules/tsx/dist/cli.mjs", "--conditions=react-server", "scripts/mail-fake.ts"], { stdio: "inherit", env: process.env }));
}
const server = spawn("node", ["scripts/serve.mjs", "-p", port], { stdio: "inherit", env: process.env });
children.push(server);

let serverExited = false;
server.on("exit", () => (serverExited = true));
// The banner only once the app answers: before that the address would show a connection error.
void waitForApp(`http://127.0.0.1:${port}/api/health`, { gaveUp: () => serverExited }).then((ready) => {
  if (!ready) {
    if (!serverExited) console.error(`✗ The app did not answer on port ${port} within two minutes; see the messages above.`);
    return;
  }
  console.log(`\nRimebook is running at ${process.env.APP_ORIGIN}`);
  console.log(`Demo farm: ${demoFarm.name}. Sign in as any of:`);
  for (const m of demoMembers) console.log(`  ${m.role.padEnd(7)} ${m.email.padEnd(30)} password: ${m.password}`);
  if (fs.existsSync("scripts/mail-fake.ts")) console.log(`Captured e-mail (invites, resets, digests): ${process.env.APP_ORIGIN}/dev/mailbox`);
  console.log("Press Ctrl+C to stop.");
});

const stop = () => {
  for (const c of children) c.kill("SIGTERM");
  process.exit(0);
};
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
server.on("exit", (code) => {
  for (const c of children) c.kill("SIGTERM");
  process.exit(code ?? 0);
});
