// Starts the production build as one process on a fresh SQLite file (or, for a test that asks and reads the
// database through databaseUrl, a fresh database on the PostgreSQL server of TEST_DATABASE_URL), with its own mail folder and uploads, and stops it by its id afterwards. Mail goes over real SMTP to the local fake (when the accounts work
// providing it is present) which stores it where the server's mailbox page reads it.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { ARTIFACTS, E2E_DIST_DIR, ROOT, ensureBuild } from "./build";
import { createPostgresDatabase, testServerUrl } from "../../support/postgres";

export type MailFakeHandle = { port: number; dir: string; close: () => Promise<void> };

export type AppServer = {
  origin: string;
  port: number;
  dir: string;
  /** The SQLite file ("" on PostgreSQL). */
  databaseFile: string;
  /** The server's DATABASE_URL. */
  databaseUrl: string;
  mailboxDir: string;
  uploadDir: string;
  env: Record<string, string>;
  process: ChildProcess;
  /** Stops the server (SIGTERM, then SIGKILL) and removes its files. */
  stop: () => Promise<void>;
  /** Kills the server with SIGKILL at once, as a power cut would. */
  kill: () => Promise<void>;
  /** Starts the server again on the same port and database. */
  restart: () => Promise<void>;
};

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
  });
}

/** Runs the knex CLI exactly as `npm run db:migrate` / `npm run db:seed` do, on the given database. */
export function runKnex(command: "migrate:latest" | "seed:run", databaseUrl: string): void {
  const r = spawnSync(
    process.execPath,
    ["node_modules/tsx/dist/cli.mjs", "--conditions=react-server", "node_modules/knex/bin/cli.js", "--knexfile", "knexfile.ts", command],
    { cwd: ROOT, env: { ...process.env, DATABASE_URL: databaseUrl, NODE_ENV: "development" }, encoding: "utf8" },
  );
  if (r.status !== 0) throw new Error(`knex ${command} failed:\n${r.stdout}\n${r.stderr}`);
}

/** The accounts work's SMTP fake, if it exists in this tree; otherwise mail is simply not delivered. */
async function startMailFakeIfPresent(dir: string): Promise<MailFakeHandle | null> {
  const file = path.join(ROOT, "lib/server/mail-fake.ts");
  if (!fs.existsSync(file)) return null;
  const mod = (await import(/* @vite-ignore */ file)) as {
    startMailFake: (o: { port?: number; dir?: string; quiet?: boolean }) => Promise<MailFakeHandle>;
  };
  return mod.startMailFake({ port: 0, dir, quiet: true });
}

async function waitForHealth(origin: string, child: ChildProcess, timeoutMs = 60_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  let last = "";
  while (Date.now() < deadline) {
    if (child.exitCode !== null || child.signalCode !== null) throw new Error(`server exited early (${child.exitCode ?? child.signalCode})`);
    try {
      const res = await fetch(`${origin}/api/health`);
      if (res.ok) return;
      last = `HTTP ${res.status}`;
    } catch (err) {
      last = (err as Error).message;
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`server at ${origin} not healthy after ${timeoutMs} ms (${last})`);
}

export type StartOptions = {
  /** Load the demo farm (Bramblewick Native Nursery) with `db:seed`. */
  seed?: boolean;
  /** Name used for the server log in artifacts/e2e. */
  name?: string;
  env?: Record<string, string>;
  /** Serve the local mailbox page (default true, as the demo does); false serves as plain `npm start`. */
  mailboxPage?: boolean;
  /** Run on the PostgreSQL server of TEST_DATABASE_URL when one is set (the test reads the database by databaseUrl). */
  onTestServer?: boolean;
};

export async function startApp(opts: StartOptions = {}): Promise<AppServer> {
  await ensureBuild();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-e2e-"));
  const pgServer = opts.onTestServer ? testServerUrl() : null;
  const pg = pgServer ? await createPostgresDatabase(pgServer) : null;
  const databaseFile = pg ? "" : path.join(dir, "app.sqlite");
  const databaseUrl = pg?.url ?? `file:${databaseFile}`;
  runKnex("migrate:latest", databaseUrl);
  if (opts.seed) runKnex("seed:run", databaseUrl);

  const mailboxDir = path.join(dir, "mailbox");
  const uploadDir = path.join(dir, "uploads");
  fs.mkdirSync(mailboxDir, { recursive: true });
  fs.mkdirSync(uploadDir, { recursive: true });
  const mail = await startMailFakeIfPresent(mailboxDir);
  const port = await freePort();
  const origin = `http://127.0.0.1:${port}`;
  const env: Record<string, string> = {
    NODE_ENV: "production",
    NEXT_TELEMETRY_DISABLED: "1",
    NEXT_DIST_DIR: E2E_DIST_DIR,
    DATABASE_URL: databaseUrl,
    SESSION_SECRET: randomBytes(32).toString("hex"),
    CRON_SECRET: randomBytes(16).toString("hex"),
    APP_ORIGIN: origin,
    SMTP_URL: `smtp://127.0.0.1:${mail?.port ?? 1}`,
    MAILBOX_DIR: mailboxDir,
    // As `npm run demo` does: the suite reads reset and invite links from the local mailbox page.
    ...(opts.mailboxPage === false ? {} : { MAILBOX_PAGE: "on" }),
    UPLOAD_DIR: uploadDir,
    ...opts.env,
  };
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  const logFile = path.join(ARTIFACTS, `server-${opts.name ?? "app"}-${port}.log`);

  const launch = async (): Promise<ChildProcess> => {
    const log = fs.openSync(logFile, "a");
    // `npm start`: Next behind the front door that reads the caller's address from the socket.
    const child = spawn(process.execPath, ["scripts/serve.mjs", "-p", String(port), "-H", "127.0.0.1"], {
      cwd: ROOT,
      stdio: ["ignore", log, log],
      env: { PATH: process.env.PATH ?? "", HOME: process.env.HOME ?? os.tmpdir(), ...env } as unknown as NodeJS.ProcessEnv,
    });
    fs.closeSync(log);
    await waitForHealth(origin, child);
    return child;
  };

  const exited = (child: ChildProcess) =>
    child.exitCode !== null || child.signalCode !== null ? Promise.resolve() : new Promise<void>((r) => child.once("exit", () => r()));

  const app: AppServer = {
    origin,
    port,
    dir,
    databaseFile,
    databaseUrl,
    mailboxDir,
    uploadDir,
    env,
    process: await launch(),
    async kill() {
      app.process.kill("SIGKILL");
      await exited(app.process);
    },
    async restart() {
      app.process = await launch();
    },
    async stop() {
      const child = app.process;
      if (child.exitCode === null && child.signalCode === null) {
        child.kill("SIGTERM");
        const timer = setTimeout(() => child.kill("SIGKILL"), 5000);
        await exited(child);
        clearTimeout(timer);
      }
      await mail?.close();
      await pg?.drop();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
  return app;
}
