// `npm run bench`: Rimebook's performance figures, each beside a baseline measured in the same run on the same
// machine, so the ratio means something wherever it is run. Not part of `npm test`.
//   npm run bench                    all benchmarks
//   npm run bench -- push qr         only some (push, pull, firstload, offline, today, history, qr)
// Results: a table on stdout, plus artifacts/bench/results.{json,md}.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import http from "node:http";
import { randomUUID } from "node:crypto";
import { spawn, spawnSync } from "node:child_process";
import { performance } from "node:perf_hooks";
// The phone store's IndexedDB for the Today benchmark (in memory).
import "fake-indexeddb/auto";

const ROOT = path.resolve(__dirname, "../..");
const OUT = path.join(ROOT, "artifacts", "bench");
const TMP = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-bench-"));
process.env.UPLOAD_DIR ??= path.join(TMP, "uploads");
process.env.MAILBOX_DIR ??= path.join(TMP, "mailbox");
process.env.NEXT_TELEMETRY_DISABLED = "1";

type Row = { bench: string; measure: string; value: number; unit: string; baseline: string; baselineValue: number; ratio: number; note?: string };
const rows: Row[] = [];
const failures: string[] = [];
const notes: string[] = [];

function record(r: Omit<Row, "ratio"> & { higherIsBetter?: boolean }) {
  const { higherIsBetter, ...rest } = r;
  // Ratio is always "how many times the baseline's cost": >1 means slower/heavier than the baseline.
  const ratio = higherIsBetter ? r.baselineValue / r.value : r.value / r.baselineValue;
  rows.push({ ...rest, ratio });
  console.log(`  ${r.bench} · ${r.measure}: ${fmt(r.value)} ${r.unit} vs ${fmt(r.baselineValue)} ${r.unit} (${r.baseline}) → ×${ratio.toFixed(2)}`);
}

const fmt = (n: number) => (n >= 100 ? n.toFixed(0) : n >= 10 ? n.toFixed(1) : n.toFixed(2));
const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
};
/** One sample per call: never start two samples together (a Promise.all over synchronous work times them all). */
const time = async (fn: () => unknown | Promise<unknown>) => {
  const t = performance.now();
  await fn();
  return performance.now() - t;
};
/** `n` samples of `fn`, one after the other. */
const samples = async (n: number, fn: () => unknown | Promise<unknown>) => {
  const out: number[] = [];
  for (let i = 0; i < n; i++) out.push(await time(fn));
  return out;
};

// ---------------------------------------------------------------------------------------------------------
// 1. Sync push apply: 10,000 check mutations through POST /api/sync/push vs raw better-sqlite3 inserts.

const CHECKS = 10_000;

/** A fresh SQLite file with an owner, a lot and a bag; `push` sends mutations through POST /api/sync/push. */
async function pushBenchFarm(name: string) {
  const { useDatabase } = await import("@/lib/server/db");
  const { signedInMember, memberRequest } = await import("../support/auth");
  const { POST } = await import("@/app/api/sync/push/route");
  const db = await useDatabase(`file:${path.join(TMP, name)}`);
  await db.migrate.latest();
  const owner = await signedInMember(db, { role: "owner" });
  const ctx = { params: Promise.resolve({}) };
  const push = async (mutations: unknown[]) => {
    const res = await POST(memberRequest("/api/sync/push", owner, { method: "POST", json: { deviceId: "bench-phone", mutations } }), ctx);
    const body = (await res.json()) as { applied: string[]; rejected: { id: string; error: unknown }[] };
    if (res.status !== 200 || body.rejected.length) throw new Error(`push refused: ${res.status} ${JSON.stringify(body).slice(0, 300)}`);
    return body;
  };
  const m = (name: string, args: unknown) => ({ id: randomUUID(), name, args, at: new Date().toISOString() });
  const lotId = randomUUID();
  const bagId = randomUUID();
  await push([m("lot.create", { id: lotId, species: "Asclepias tuberosa", year: 2025, quantity: 400 }), m("bag.create", { id: bagId, code: "7K3Q9M-X", lot_id: lotId, start_date: "2026-11-01" })]);
  /** `CHECKS` check mutations of the bag, a minute apart from minute `from`. */
  const checks = (from = 0) =>
    Array.from({ length: CHECKS }, (_, i) =>
      m("check.record", { id: randomUUID(), bag_id: bagId, checked_at: new Date(Date.UTC(2026, 10, 1) + (from + i) * 60_000).toISOString(), moisture: "damp", mould: "clean", sprouts: "none", actions: [] }),
    );
  return { db, owner, ctx, push, bagId, checks, memberRequest };
}

async function benchPush() {
  const { useDatabase } = await import("@/lib/server/db");
  const { db, owner, push, bagId, checks } = await pushBenchFarm("push.sqlite");
  const mutations = checks();
  const counts = async () => {
    const names = (await db.raw("SELECT name FROM sqlite_master WHERE type='table' AND name NOT LIKE 'sqlite_%' AND name NOT LIKE 'knex_%'")) as { name: string }[];
    const out: Record<string, number> = {};
    for (const { name } of names) out[name] = Number((await db(name).count({ n: "*" }))[0].n);
    return out;
  };
  const before = await counts();
  const seqBefore = Number((await db("farms").where({ id: owner.farmId }).first("seq")).seq);
  const pushMs = await time(async () => {
    for (let i = 0; i < mutations.length; i += 1000) await push(mutations.slice(i, i + 1000));
  });
  const after = await counts();
  const seqAfter = Number((await db("farms").where({ id: owner.farmId }).first("seq")).seq);
  const stored = await db("checks").where({ bag_id: bagId }).select();
  if (stored.length !== CHECKS) throw new Error(`expected ${CHECKS} checks stored, found ${stored.length}`);
  const ids = new Set<string>(mutations.map((x) => x.id));
  const applied = (await db("applied_mutations").select()).filter((r: { id: string }) => ids.has(r.id));
  if (applied.length !== CHECKS) throw new Error(`expected ${CHECKS} applied-mutation records, found ${applied.length}`);
  // What one check mutation writes, so the fair floor below writes the same (anything else would be a lie).
  const grew = Object.entries(after).filter(([t, n]) => n !== before[t]).map(([t, n]) => `${t} +${n - before[t]}`);
  console.log(`  rows written by the push: ${grew.join(", ")}; farm seq +${seqAfter - seqBefore}`);
  const unexpected = Object.entries(after).filter(([t, n]) => n !== before[t] && t !== "checks" && t !== "applied_mutations");
  if (unexpected.length) notes.push(`push: the check mutations also wrote ${unexpected.map(([t]) => t).join(", ")}, which the floors do not`);

  // Floors: the very rows the push stored, inserted with prepared statements in one transaction into a fresh
  // file with the same migrations and pragmas (WAL, synchronous NORMAL, foreign keys on). Every other row (farm,
  // user, lot, bag, protocols…) is copied first, untimed, so the foreign keys hold.
  //   fair floor: every row a check mutation writes (the check, its applied_mutations record, the farm's seq bump)
  //   checks only: the old floor, the check rows alone
  const tables = (await db.raw("SELECT name FROM sqlite_master WHERE type='table' AND name NOT LIKE 'sqlite_%' AND name NOT LIKE 'knex_%'")) as { name: string }[];
  const parents: Record<string, Record<string, unknown>[]> = {};
  for (const { name } of tables) parents[name] = await db(name).select();
  const storedIds = new Set(stored.map((c: { id: string }) => c.id));
  parents.checks = parents.checks.filter((r) => !storedIds.has(String(r.id)));
  parents.applied_mutations = parents.applied_mutations.filter((r) => !ids.has(String(r.id)));
  await db.destroy();
  const Database = (await import("better-sqlite3")).default;
  const freshRaw = async (name: string) => {
    const file = path.join(TMP, name);
    const base = await useDatabase(`file:${file}`);
    await base.migrate.latest();
    await base.destroy();
    const raw = new Database(file);
    raw.pragma("journal_mode = WAL");
    raw.pragma("synchronous = NORMAL");
    const prepare = (table: string, list: Record<string, unknown>[]) => {
      const cols = Object.keys(list[0]);
      const stmt = raw.prepare(`INSERT INTO ${table} (${cols.map((c) => `"${c}"`).join(",")}) VALUES (${cols.map(() => "?").join(",")})`);
      return (r: Record<string, unknown>) => stmt.run(cols.map((c) => r[c] as never));
    };
    raw.pragma("foreign_keys = OFF");
    // Copy order does not matter with foreign keys off; the farm's seq is set back to before the push.
    raw.transaction(() => {
      for (const [t, list] of Object.entries(parents)) if (list.length) list.forEach(prepare(t, list));
      raw.prepare("UPDATE farms SET seq = ? WHERE id = ?").run(seqBefore, owner.farmId);
    })();
    raw.pragma("foreign_keys = ON");
    return { raw, prepare };
  };
  const onlyChecks = await freshRaw("raw-checks.sqlite");
  const insertCheck = onlyChecks.prepare("checks", stored);
  const rawMs = await time(() => onlyChecks.raw.transaction(() => stored.forEach(insertCheck))());
  onlyChecks.raw.close();
  const fair = await freshRaw("raw-fair.sqlite");
  const check = fair.prepare("checks", stored);
  const record_ = fair.prepare("applied_mutations", applied);
  const bump = fair.raw.prepare("UPDATE farms SET seq = seq + 1 WHERE id = ? RETURNING seq");
  const fairMs = await time(() =>
    fair.raw.transaction(() => {
      for (let i = 0; i < stored.length; i++) {
        bump.get(owner.farmId);
        check(stored[i]);
        record_(applied[i]);
      }
    })(),
  );
  fair.raw.close();
  const what = `apply ${CHECKS.toLocaleString("en")} check mutations (10 pushes of 1,000)`;
  const fairName = "fair floor: each mutation's check + applied-mutation record + farm seq bump, raw better-sqlite3, one transaction";
  record({ bench: "sync push", measure: what, value: pushMs, unit: "ms", baseline: fairName, baselineValue: fairMs });
  record({ bench: "sync push", measure: "per check mutation", value: (pushMs * 1000) / CHECKS, unit: "µs", baseline: "fair floor per mutation", baselineValue: (fairMs * 1000) / CHECKS });
  record({ bench: "sync push", measure: "per check mutation", value: (pushMs * 1000) / CHECKS, unit: "µs", baseline: "old floor: raw insert of the check rows only", baselineValue: (rawMs * 1000) / CHECKS });
  await benchPullsDuringPush();
}

/**
 * A big push must not starve the farm's other phones: p99 of pulls (route handlers in this process, one after
 * another, as the server's event loop would take them) while a 10,000-check push applies, against p99 of the
 * same pulls with nothing else running, on the same database in the same run.
 */
async function benchPullsDuringPush() {
  const { GET } = await import("@/app/api/sync/pull/route");
  const { db, owner, ctx, push, checks, memberRequest } = await pushBenchFarm("push-pulls.sqlite");
  await push(checks().slice(0, 1000)); // the pulls read a full page in both runs
  const pullOnce = async () => {
    const res = await GET(memberRequest("/api/sync/pull?since=0&limit=100", owner), ctx);
    if (res.status !== 200) throw new Error(`pull ${res.status}`);
    await res.arrayBuffer();
  };
  const p99 = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(xs.length * 0.99))];
  const idle = await samples(300, pullOnce);
  const during: number[] = [];
  let pushing = true;
  const mutations = checks(CHECKS);
  const pushed = (async () => {
    for (let i = 0; i < mutations.length; i += 1000) await push(mutations.slice(i, i + 1000));
  })().finally(() => (pushing = false));
  while (pushing) during.push(await time(pullOnce));
  await pushed;
  await db.destroy();
  record({ bench: "sync push", measure: `p99 of pulls during a 10,000-check push (${during.length} pulls)`, value: p99(during), unit: "ms", baseline: `p99 of the same pulls with no push running (${idle.length} pulls)`, baselineValue: p99(idle) });
}

// ---------------------------------------------------------------------------------------------------------
// The production server (for pull, first-load JS and offline reload).

type Server = Awaited<ReturnType<typeof import("../e2e/support/server").startApp>>;
let server: Server | null = null;
let cookie = "";
const FLOOR_FILE = path.join(TMP, "pull-floor.json");

async function getServer(): Promise<Server> {
  if (server) return server;
  const { startApp } = await import("../e2e/support/server");
  console.log("  (starting the production build; builds .next-e2e first if it is missing or stale)");
  // The framework floor route (app/api/bench/floor) answers only when the server is started with this file.
  server = await startApp({ name: "bench", env: { RIMEBOOK_BENCH_FLOOR_FILE: FLOOR_FILE } });
  const res = await fetch(`${server.origin}/api/auth/sign-up`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: server.origin },
    body: JSON.stringify({ email: "bench@bramblewick.example", password: "frost on the barn door", name: "Bench Grower", farmName: "Bramblewick Bench" }),
  });
  if (res.status !== 201 && res.status !== 200) throw new Error(`sign-up failed: ${res.status} ${await res.text()}`);
  cookie = res.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
  return server;
}

async function httpPush(app: Server, mutations: unknown[]) {
  const res = await fetch(`${app.origin}/api/sync/push`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: app.origin, cookie },
    body: JSON.stringify({ deviceId: "bench-phone", mutations }),
  });
  if (!res.ok) throw new Error(`push ${res.status}: ${await res.text()}`);
  return res.json();
}

// 2. Pull under autocannon (50 connections, Accept-Encoding: gzip as phones send it), each figure beside floors
// served by their own processes, never beside the load generator:
//   framework floor: a route handler of the same build answering the same JSON with no database (app/api/bench/floor)
//   session floor: the same route with the session check only
//   bare node:http: a plain server in its own process, serialising the same JSON (and gzipping it when asked)
// Throughput swings on a shared machine, so each run also reports the server process's CPU time per request.

const CLK_TCK = Number(spawnSync("getconf", ["CLK_TCK"], { encoding: "utf8" }).stdout.trim()) || 100;
/** CPU seconds (user + system) the process has used so far, from /proc (Linux). */
function cpuSeconds(pid: number): number {
  const stat = fs.readFileSync(`/proc/${pid}/stat`, "utf8");
  const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
  return (Number(fields[11]) + Number(fields[12])) / CLK_TCK;
}

const BARE_SERVER = `
const http = require("node:http"), zlib = require("node:zlib"), fs = require("node:fs");
const body = JSON.parse(fs.readFileSync(process.argv[1], "utf8"));
const server = http.createServer((req, res) => {
  const json = Buffer.from(JSON.stringify(body));
  if (/\\bgzip\\b/.test(req.headers["accept-encoding"] || "")) {
    const gz = zlib.gzipSync(json);
    res.writeHead(200, { "content-type": "application/json", "content-encoding": "gzip", vary: "Accept-Encoding", "content-length": gz.length });
    res.end(gz);
  } else {
    res.writeHead(200, { "content-type": "application/json", "content-length": json.length });
    res.end(json);
  }
});
server.listen(0, "127.0.0.1", () => process.stdout.write(String(server.address().port) + "\\n"));
`;

async function startBare(file: string): Promise<{ port: number; pid: number; stop: () => void }> {
  const child = spawn(process.execPath, ["-e", BARE_SERVER, file], { stdio: ["ignore", "pipe", "inherit"] });
  const port = await new Promise<number>((resolve, reject) => {
    child.stdout!.once("data", (d: Buffer) => resolve(Number(String(d).trim())));
    child.once("exit", (code) => reject(new Error(`bare server exited (${code})`)));
  });
  return { port, pid: child.pid!, stop: () => child.kill("SIGTERM") };
}

async function benchPull() {
  const app = await getServer();
  const m = (name: string, args: unknown) => ({ id: randomUUID(), name, args, at: new Date().toISOString() });
  const lotId = randomUUID();
  const bagId = randomUUID();
  await httpPush(app, [m("lot.create", { id: lotId, species: "Echinacea pallida", year: 2025, quantity: 900 }), m("bag.create", { id: bagId, code: "PULL01-A", lot_id: lotId, start_date: "2026-11-01" })]);
  for (let b = 0; b < 2; b++) {
    await httpPush(app, Array.from({ length: 500 }, (_, i) => m("check.record", { id: randomUUID(), bag_id: bagId, checked_at: new Date(Date.UTC(2026, 10, 2) + (b * 500 + i) * 60_000).toISOString(), moisture: "damp", mould: "clean", sprouts: "none", actions: [] })));
  }
  const url = `${app.origin}/api/sync/pull?since=0&limit=100`;
  const sample = await fetch(url, { headers: { cookie } });
  if (!sample.ok) throw new Error(`pull ${sample.status}`);
  const body = await sample.text();
  const changes = (JSON.parse(body) as { changes: unknown[] }).changes.length;
  fs.writeFileSync(FLOOR_FILE, body);
  // The bytes on the wire when the phone asks for gzip (whoever compresses them: the route or the framework).
  const onWire = await new Promise<{ bytes: number; encoding: string }>((resolve, reject) => {
    http.get(url, { headers: { cookie, "accept-encoding": "gzip" } }, (res) => {
      let bytes = 0;
      res.on("data", (d: Buffer) => (bytes += d.length));
      res.on("end", () => resolve({ bytes, encoding: String(res.headers["content-encoding"] ?? "identity") }));
    }).on("error", reject);
  });
  const floorCheck = await fetch(`${app.origin}/api/bench/floor?session=1`, { headers: { cookie } });
  if (!floorCheck.ok || JSON.stringify(await floorCheck.json()) !== JSON.stringify(JSON.parse(body))) throw new Error(`the framework floor did not answer the pull's JSON (${floorCheck.status})`);

  const bare = await startBare(FLOOR_FILE);
  const autocannon = (await import("autocannon")).default;
  const seconds = Number(process.env.BENCH_SECONDS ?? 10);
  const gzip = { "accept-encoding": "gzip" };
  const load = async (target: string, headers: Record<string, string>, pid: number) => {
    const cpu0 = cpuSeconds(pid);
    const run = await autocannon({ url: target, connections: 50, duration: seconds, headers });
    const cpuMs = ((cpuSeconds(pid) - cpu0) * 1000) / Math.max(run.requests.total, 1);
    if (run.non2xx) failures.push(`pull: ${run.non2xx} answers of ${target} were not 2xx under load`);
    if (run.errors) notes.push(`pull: ${run.errors} requests to ${target} timed out (autocannon's 10 s) under load`);
    return { ...run, cpuMs };
  };
  const appPid = app.process.pid!;
  const appRun = await load(url, { cookie, ...gzip }, appPid);
  const plainRun = await load(url, { cookie }, appPid);
  const floorRun = await load(`${app.origin}/api/bench/floor`, gzip, appPid);
  const sessionRun = await load(`${app.origin}/api/bench/floor?session=1`, { cookie, ...gzip }, appPid);
  const bareRun = await load(`http://127.0.0.1:${bare.port}/`, gzip, bare.pid);
  bare.stop();
  const what = `GET /api/sync/pull (${changes} changes, ${(body.length / 1024).toFixed(0)} kB JSON, ${(onWire.bytes / 1024).toFixed(1)} kB on the wire as ${onWire.encoding}), 50 connections, Accept-Encoding: gzip`;
  const floor = "framework floor: Next route handler, same JSON, no database";
  record({ bench: "sync pull", measure: `${what}: CPU per request`, value: appRun.cpuMs, unit: "ms", baseline: floor, baselineValue: floorRun.cpuMs });
  record({ bench: "sync pull", measure: "requests/s", value: appRun.requests.average, unit: "req/s", baseline: floor, baselineValue: floorRun.requests.average, higherIsBetter: true });
  record({ bench: "sync pull", measure: "latency p50", value: appRun.latency.p50, unit: "ms", baseline: `${floor}, p50`, baselineValue: Math.max(floorRun.latency.p50, 0.5) });
  record({ bench: "sync pull", measure: "latency p99", value: appRun.latency.p99, unit: "ms", baseline: `${floor}, p99`, baselineValue: Math.max(floorRun.latency.p99, 0.5) });
  record({ bench: "sync pull", measure: "CPU per request", value: appRun.cpuMs, unit: "ms", baseline: "session floor: the same route with the session check only", baselineValue: sessionRun.cpuMs });
  record({ bench: "sync pull", measure: "the same pull without Accept-Encoding: CPU per request", value: plainRun.cpuMs, unit: "ms", baseline: "the pull with gzip", baselineValue: appRun.cpuMs });
  record({ bench: "sync pull", measure: "the same pull without Accept-Encoding: requests/s", value: plainRun.requests.average, unit: "req/s", baseline: "the pull with gzip", baselineValue: appRun.requests.average, higherIsBetter: true });
  record({ bench: "sync pull", measure: "framework floor: CPU per request", value: floorRun.cpuMs, unit: "ms", baseline: "bare node:http in its own process, same JSON serialised and gzipped per request", baselineValue: bareRun.cpuMs });
  record({ bench: "sync pull", measure: "framework floor: requests/s", value: floorRun.requests.average, unit: "req/s", baseline: "bare node:http, requests/s", baselineValue: bareRun.requests.average, higherIsBetter: true });
}

// 3. First-load JS per route (gzip) vs the framework floor (the built-in not-found page of the same build).

async function benchFirstLoad() {
  const app = await getServer();
  const { distPath } = await import("../e2e/support/build");
  const routes = Object.values(JSON.parse(fs.readFileSync(distPath("app-path-routes-manifest.json"), "utf8")) as Record<string, string>)
    .filter((r) => !r.startsWith("/api") && !r.startsWith("/_") && !r.includes("["))
    .sort();
  const { measureFirstLoad, FLOOR_ROUTE } = await import("../e2e/support/first-load");
  const scriptsOf = (route: string) => measureFirstLoad(app.origin, route, cookie);
  const floor = await scriptsOf(FLOOR_ROUTE);
  console.log(`  framework floor (not-found page): ${(floor.total / 1024).toFixed(1)} kB gzip in ${floor.count} scripts`);
  for (const route of routes) {
    const r = await scriptsOf(route);
    if (!r.html) continue;
    if (r.status >= 300) {
      console.log(`  ${route}: HTTP ${r.status} (skipped)`);
      continue;
    }
    record({ bench: "first-load JS", measure: `${route} (gzip, ${r.count} scripts)`, value: r.total / 1024, unit: "kB", baseline: "framework floor: empty not-found page, same build", baselineValue: floor.total / 1024 });
  }
}

// 4. Offline reload of the app shell in Chromium (service worker) vs the same reload online over loopback.

async function benchOffline() {
  const app = await getServer();
  const { launchChromium, phoneContext } = await import("../e2e/support/browser");
  const browser = await launchChromium();
  try {
    const context = await phoneContext(browser, app.origin);
    await context.addCookies(cookie.split("; ").map((c) => ({ name: c.split("=")[0], value: c.slice(c.indexOf("=") + 1), url: app.origin })));
    const page = await context.newPage();
    const route = process.env.BENCH_SHELL_ROUTE ?? "/today";
    await page.goto(route, { waitUntil: "load" });
    const controlled = await page
      .waitForFunction(() => navigator.serviceWorker?.controller != null, undefined, { timeout: 20_000 })
      .then(() => true)
      .catch(() => false);
    if (!controlled) throw new Error(`no service worker took control of ${route}`);
    const reloads = async () => {
      const times: number[] = [];
      for (let i = 0; i < 12; i++) {
        await page.reload({ waitUntil: "load" });
        times.push(await page.evaluate(() => (window.performance.getEntriesByType("navigation")[0] as PerformanceNavigationTiming).loadEventEnd));
      }
      return median(times.slice(2));
    };
    const online = await reloads();
    await context.setOffline(true);
    const offline = await reloads();
    const ok = await page.evaluate(() => document.body.innerText.length > 0);
    if (!ok) throw new Error("offline reload rendered an empty page");
    record({ bench: "offline shell", measure: `reload ${route} offline (navigation to load event, median of 10)`, value: offline, unit: "ms", baseline: "same reload online over loopback", baselineValue: online });
  } finally {
    await browser.close();
  }
}

// 5. Today's round over 10,000 bags in the phone store (fake-indexeddb + lib/domain), the way the Today screen does it.

const BAGS = 10_000;

/** The Today benchmarks' farm: the demo farm pulled through the pull handler, its bags cloned to 10,000, with checks
 *  and a logger's season of readings in each store. */
async function makeTodayFarm() {
  const { formatIsoDay } = await import("@/lib/domain/dates");

  // Real row shapes: the demo farm pulled through the pull handler, then its bags cloned to 10,000.
  const { useDatabase } = await import("@/lib/server/db");
  const { runKnex } = await import("../e2e/support/server");
  const file = path.join(TMP, "demo.sqlite");
  runKnex("migrate:latest", `file:${file}`);
  runKnex("seed:run", `file:${file}`);
  const db = await useDatabase(`file:${file}`);
  const { pullChanges } = await import("@/lib/server/sync/pull");
  const farm = await db("farms").first();
  const byTable: Record<string, Record<string, unknown>[]> = {};
  for (let since = 0, more = true; more; ) {
    const page = await pullChanges(db, farm.id, since, 5000);
    for (const c of page.changes) (byTable[c.table] ??= []).push(c.row);
    since = Number(page.cursor);
    more = page.more;
  }
  await db.destroy();
  const demoBags = byTable.bags ?? [];
  if (!demoBags.length) throw new Error("the demo farm has no bags to clone");
  const today = formatIsoDay(new Date());
  const day = (offset: number) => formatIsoDay(new Date(Date.now() - offset * 86_400_000));
  const bags = Array.from({ length: BAGS }, (_, i) => {
    const b = demoBags[i % demoBags.length];
    return { ...b, id: randomUUID(), code: `BN${String(i).padStart(5, "0")}-X`, start_date: b.start_date ? day(i % 150) : b.start_date };
  });
  const checks = bags.filter((_, i) => i % 3 === 0).map((b, i) => ({
    ...(byTable.checks?.[0] ?? {}),
    id: randomUUID(),
    bag_id: b.id,
    checked_at: new Date(Date.now() - (i % 9) * 86_400_000).toISOString(),
    moisture: i % 7 === 0 ? "soggy" : "damp",
    mould: i % 11 === 0 ? "spots" : "clean",
    sprouts: i % 13 === 0 ? "first_roots" : "none",
    actions: [],
    deleted_at: null,
  }));

  // Each store's readings: the demo season (every six hours) plus a logger's every ten minutes over 150 days, with a
  // warm five hours every ten days (invented for the benchmark), so the bags' windows really move.
  // BENCH_LOGGER_MINUTES=0 leaves the logger out (demo readings only); another number changes its interval.
  const loggerMinutes = Number(process.env.BENCH_LOGGER_MINUTES ?? 10);
  const perDay = loggerMinutes > 0 ? Math.round(1440 / loggerMinutes) : 0;
  const loggerReadings = (byTable.stores ?? []).flatMap((store) =>
    Array.from({ length: 150 * perDay }, (_, k) => ({
      ...(byTable.readings?.[0] ?? {}),
      id: randomUUID(),
      store_id: store.id,
      taken_at: new Date(Date.now() - (150 * perDay - k) * loggerMinutes * 60_000).toISOString(),
      temperature_c: k % (10 * perDay) < (5 * 60) / loggerMinutes ? 12.5 : 3.5 + (k % 7) / 10,
      origin: "import",
      check_id: null,
      deleted_at: null,
    })),
  );
  const readings = [...(byTable.readings ?? []), ...loggerReadings];
  return { byTable, bags, checks, readings, today };
}

async function benchToday() {
  const { RimebookDB } = await import("@/lib/client/db");
  const { loadFarmRows, loadLastChecks } = await import("@/lib/client/fridge-reads");
  const { buildRoundFromRows, cadenceFor } = await import("@/lib/domain/rows/round-input");
  const { buildBagRows } = await import("@/lib/domain/rows/bag-rows");
  const farm = await makeTodayFarm();
  // BENCH_TODAY_BROWSER=only: the Chromium figures alone; =0: without them.
  if (process.env.BENCH_TODAY_BROWSER === "only") return benchTodayInChromium(farm);
  const { byTable, bags, checks, readings, today } = farm;

  const phone = new RimebookDB(`bench-${randomUUID()}`);
  await phone.transaction("rw", [phone.protocols, phone.lots, phone.stores, phone.bags, phone.checks, phone.readings], async () => {
    await phone.protocols.bulkPut((byTable.protocols ?? []) as never[]);
    await phone.lots.bulkPut((byTable.lots ?? []) as never[]);
    await phone.stores.bulkPut((byTable.stores ?? []) as never[]);
    await phone.bags.bulkPut(bags as never[]);
    await phone.checks.bulkPut(checks as never[]);
    await phone.readings.bulkPut(readings as never[]);
  });

  let due = 0;
  const { loadSpeciesWindows } = await import("@/lib/client/history-reads");
  // As the Today screen does it, with the farm's own history (finished bags' checks) turning bags daily.
  const loadRound = async () => {
    const rows = await loadFarmRows(phone, "in_cold");
    const live = rows.bags.filter((b) => !b.deleted_at && b.start_date && !b.pulled_on && !b.sown_on && !b.discarded_on);
    const [lastChecks, farmWindows] = await Promise.all([loadLastChecks(phone, live.map((b) => b.id)), loadSpeciesWindows(phone, rows, today)]);
    due = buildRoundFromRows(rows, lastChecks, today, cadenceFor(7), undefined, farmWindows).items.length;
  };
  const { forgetKeptReadings } = await import("@/lib/client/kept-readings");
  // Cold: nothing kept on the phone yet (Today's first round after the app opens). Warm: the next rounds, which read
  // only what changed and prepare only the stores whose readings changed.
  const coldRound = async () => {
    forgetKeptReadings(phone);
    await loadRound();
  };
  await coldRound();
  const fullCold = median(await samples(3, coldRound));
  await loadRound();
  const full = median(await samples(3, loadRound));
  // Just the domain part, from rows already in memory.
  const rows = await loadFarmRows(phone, "in_cold");
  const live = rows.bags.filter((b) => !b.deleted_at && b.start_date && !b.pulled_on && !b.sown_on && !b.discarded_on);
  const lastChecks = await loadLastChecks(phone, live.map((b) => b.id));
  // One round per sample (five rounds started together inside Promise.all would each time several rounds).
  const domain = median(await samples(5, () => buildRoundFromRows(rows, lastChecks, today, cadenceFor(7))));
  // What the effective windows cost: the same round with the stores' readings left out (every window as planned).
  const noReadings = { ...rows, readings: [], readingsCache: undefined };
  const planned = median(await samples(5, () => buildRoundFromRows(noReadings, lastChecks, today, cadenceFor(7))));
  const moved = buildBagRows(rows, today).filter((r) => r.lostColdDays > 0).length;
  // Baselines: a plain scan of the same rows (read them all, one pass comparing dates), and reading the table alone.
  const readOnly = median([await time(() => phone.bags.toArray()), await time(() => phone.bags.toArray()), await time(() => phone.bags.toArray())]);
  let scanned = 0;
  const scan = median(
    [0, 1, 2, 3, 4].map(() => {
      const t = performance.now();
      scanned = 0;
      for (const b of rows.bags) if (b.start_date && b.start_date <= today && !b.pulled_on && !b.discarded_on) scanned++;
      return performance.now() - t;
    }),
  );
  // How much of the total is reading the fridges' readings (one read per store, from two days before its earliest bag).
  const { loadReadingsOfBagStores } = await import("@/lib/client/fridge-reads");
  const readingsRead = median(await samples(3, () => loadReadingsOfBagStores(phone, rows.bags, rows.stores, "in_cold")));
  const readingsReadCold = median(
    await samples(3, () => {
      forgetKeptReadings(phone);
      return loadReadingsOfBagStores(phone, rows.bags, rows.stores, "in_cold");
    }),
  );
  // How much of the total is the per-bag look-up of last checks: the same answer from one read of the table.
  const perBag = median([await time(() => loadLastChecks(phone, live.map((b) => b.id))), await time(() => loadLastChecks(phone, live.map((b) => b.id)))]);
  const onePass = median(
    await samples(2, async () => {
      const last = new Map<string, { checked_at: string }>();
      for (const c of await phone.checks.toArray()) if (!c.deleted_at && (last.get(c.bag_id)?.checked_at ?? "") < c.checked_at) last.set(c.bag_id, c);
    }),
  );
  phone.close();
  console.log(`  ${due} of ${BAGS} bags due today; plain scan saw ${scanned} bags in the cold; ${moved} windows moved by ${rows.readings.length.toLocaleString("en")} readings`);
  record({ bench: "Today round", measure: `${BAGS.toLocaleString("en")} bags from the phone store (Dexie read + last checks + farm history + lib/domain round), cold: nothing kept`, value: fullCold, unit: "ms", baseline: "reading the bags table alone (toArray)", baselineValue: readOnly });
  record({ bench: "Today round", measure: `the same, warm: readings kept from the last round`, value: full, unit: "ms", baseline: "reading the bags table alone (toArray)", baselineValue: readOnly });
  record({ bench: "Today round", measure: `reading ${rows.readings.length.toLocaleString("en")} fridge readings, one read per store (loadReadingsOfBagStores), cold`, value: readingsReadCold, unit: "ms", baseline: "reading the bags table alone (toArray)", baselineValue: readOnly });
  record({ bench: "Today round", measure: `the same readings, warm (only what changed is read)`, value: readingsRead, unit: "ms", baseline: "reading the bags table alone (toArray)", baselineValue: readOnly });
  record({ bench: "Today round", measure: `last check of ${live.length.toLocaleString("en")} bags, one indexed query per bag (loadLastChecks)`, value: perBag, unit: "ms", baseline: "one read of the checks table, newest per bag", baselineValue: onePass });
  record({ bench: "Today round", measure: `lib/domain round over ${BAGS.toLocaleString("en")} bags, rows in memory`, value: domain, unit: "ms", baseline: "plain array scan of the same rows", baselineValue: Math.max(scan, 0.01) });
  record({ bench: "Today round", measure: `the same round with effective windows from ${rows.readings.length.toLocaleString("en")} readings`, value: domain, unit: "ms", baseline: "the same round, readings left out (planned windows)", baselineValue: planned });
  recordOneRound(await benchOneRound(rows, lastChecks, today), rows.readings.length);
  if (process.env.BENCH_TODAY_BROWSER !== "0") await benchTodayInChromium(farm);
}

// 5c. The whole Today in Chromium over the same 10,000 bags: the production build, the phone store filled with the
// farm above, timed from the navigation (cold: a reload, nothing kept in memory) or from the tap on the Today tab
// (warm: back from Scan, the readings kept from the last round) to the round's heading showing the count. Floors:
// the same navigations on a phone whose farm is empty (framework, service worker, IndexedDB opening, React).

async function benchTodayInChromium(farm: Awaited<ReturnType<typeof makeTodayFarm>>) {
  const app = await getServer();
  const { launchChromium, phoneContext } = await import("../e2e/support/browser");
  const browser = await launchChromium();
  type Page = import("playwright-core").Page;
  const open = async () => {
    const context = await phoneContext(browser, app.origin);
    await context.addCookies(cookie.split("; ").map((c) => ({ name: c.split("=")[0], value: c.slice(c.indexOf("=") + 1), url: app.origin })));
    const page = await context.newPage();
    await page.goto("/today", { waitUntil: "load" });
    // The first pull done (an empty bench farm): the phone store is open and its identity known.
    await page.waitForFunction(() => document.querySelector("[data-testid=round-headline]")?.textContent !== "Today\u2019s round", undefined, { timeout: 60_000 });
    return { context, page };
  };
  // Today has its data when the heading is no longer the placeholder (the round's count or the first steps).
  const shown = (page: Page) =>
    page
      .waitForFunction(
        () => {
          const h = document.querySelector("[data-testid=round-headline]");
          return location.pathname === "/today" && h && h.textContent !== "Today\u2019s round" ? window.performance.now() : false;
        },
        undefined,
        { timeout: 60_000, polling: "raf" },
      )
      .then((v) => v.jsonValue() as Promise<number>);
  const cold = async (page: Page) => {
    const times: number[] = [];
    for (let i = 0; i < 6; i++) {
      await page.reload({ waitUntil: "commit" });
      times.push(await shown(page));
    }
    return median(times.slice(1));
  };
  const warm = async (page: Page) => {
    const times: number[] = [];
    for (let i = 0; i < 8; i++) {
      await page.locator('nav a[href="/scan"]').last().click();
      await page.waitForURL("**/scan");
      const start = await page.evaluate(() => {
        const t = window.performance.now();
        (Array.from(document.querySelectorAll('nav a[href="/today"]')).pop() as HTMLElement).click();
        return t;
      });
      times.push((await shown(page)) - start);
    }
    return median(times.slice(2));
  };
  try {
    const empty = await open();
    const floorCold = await cold(empty.page);
    const floorWarm = await warm(empty.page);
    await empty.context.close();

    const full = await open();
    // The farm written straight into the phone store (as a first pull leaves it), then Today opened afresh.
    const tables: [string, unknown[]][] = [
      ["protocols", farm.byTable.protocols ?? []], ["lots", farm.byTable.lots ?? []], ["stores", farm.byTable.stores ?? []],
      ["bags", farm.bags], ["checks", farm.checks], ["readings", farm.readings],
    ];
    for (const [table, rows] of tables) {
      for (let i = 0; i < rows.length; i += 5000) {
        await full.page.evaluate(
          ([name, chunk]) =>
            new Promise<void>((resolve, reject) => {
              const req = indexedDB.open("rimebook");
              req.onerror = () => reject(req.error);
              req.onsuccess = () => {
                const tx = req.result.transaction(name, "readwrite");
                const store = tx.objectStore(name);
                for (const row of chunk) store.put(row);
                tx.oncomplete = () => (req.result.close(), resolve());
                tx.onerror = () => reject(tx.error);
              };
            }),
          [table, rows.slice(i, i + 5000)] as const,
        );
      }
    }
    const todayCold = await cold(full.page);
    const headline = await full.page.locator("[data-testid=round-headline]").textContent();
    const todayWarm = await warm(full.page);
    await full.context.close();
    console.log(`  Chromium Today: "${headline}" over ${farm.bags.length.toLocaleString("en")} bags, ${farm.readings.length.toLocaleString("en")} readings`);
    const n = farm.bags.length.toLocaleString("en");
    record({ bench: "Today round", measure: `Today in Chromium, ${n} bags, cold: reload to the round's heading (median of 5)`, value: todayCold, unit: "ms", baseline: "the same reload, empty farm", baselineValue: floorCold });
    record({ bench: "Today round", measure: `Today in Chromium, ${n} bags, warm: Today tab tapped (back from Scan) to the heading (median of 6)`, value: todayWarm, unit: "ms", baseline: "the same tap, empty farm", baselineValue: floorWarm });
  } finally {
    await browser.close();
  }
}

// 5b. The lib/domain round timed one round at a time (a synchronous round inside Promise.all spans several rounds).
type OneRound = { round: number; cpu: number; cold: number; readings: number; keptReadings: number; readingsPass: number; scan: number };
async function benchOneRound(
  rows: import("@/lib/domain/rows/bag-rows").BagRowSources,
  lastChecks: ReadonlyMap<string, import("@/lib/domain/rows/round-input").LastCheckRow>,
  today: string,
): Promise<OneRound> {
  const { buildRoundFromRows, cadenceFor } = await import("@/lib/domain/rows/round-input");
  const { prepareReadingsByStore, StoreReadingsCache } = await import("@/lib/domain/rows/bag-rows");
  const sample = (fn: () => unknown, n: number) => {
    const wall: number[] = [];
    const cpu: number[] = [];
    for (let i = 0; i < n; i++) {
      const c = process.cpuUsage();
      const t = window.performance.now();
      fn();
      wall.push(performance.now() - t);
      const d = process.cpuUsage(c);
      cpu.push((d.user + d.system) / 1000);
    }
    return { wall: median(wall), cpu: median(cpu) };
  };
  // Warm: each store's prepared readings kept from the last round (as on the phone); cold: prepared afresh.
  const cache = new StoreReadingsCache();
  const round = () => buildRoundFromRows({ ...rows, readingsCache: cache }, lastChecks, today, cadenceFor(7));
  round();
  const r = sample(round, 15);
  const cold = sample(() => buildRoundFromRows({ ...rows, readingsCache: undefined }, lastChecks, today, cadenceFor(7)), 15).wall;
  const readings = sample(() => prepareReadingsByStore(rows.readings ?? []), 15).wall;
  const keptReadings = sample(() => cache.prepare(rows.readings ?? []), 15).wall;
  // The floor for preparing readings: one pass over the same rows touching each reading's time and temperature.
  const readingsPass = sample(() => {
    let n = 0;
    for (const x of rows.readings ?? []) if (!x.deleted_at && x.taken_at.length && x.temperature_c < 100) n++;
    return n;
  }, 15).wall;
  const scan = sample(() => {
    let n = 0;
    for (const b of rows.bags) if (b.start_date && b.start_date <= today && !b.pulled_on && !b.discarded_on) n++;
    return n;
  }, 15).wall;
  return { round: r.wall, cpu: r.cpu, cold, readings, keptReadings, readingsPass: Math.max(readingsPass, 0.01), scan: Math.max(scan, 0.01) };
}

function recordOneRound(o: OneRound, readingCount: number) {
  const baseline = "plain array scan of the same rows";
  console.log(`  one round at a time (median of 15): ${fmt(o.round)} ms warm, ${fmt(o.cold)} ms cold`);
  record({ bench: "Today round", measure: "lib/domain round, one at a time, warm: readings prepared in the last round kept (median of 15)", value: o.round, unit: "ms", baseline, baselineValue: o.scan });
  record({ bench: "Today round", measure: "the same round, cold: every store's readings prepared afresh (median of 15)", value: o.cold, unit: "ms", baseline, baselineValue: o.scan });
  record({ bench: "Today round", measure: "the warm round, CPU time of one round (process, median of 15)", value: o.cpu, unit: "ms", baseline, baselineValue: o.scan });
  const pass = "one pass over the same reading rows";
  record({ bench: "Today round", measure: `preparing ${readingCount.toLocaleString("en")} readings, cold (prepareReadingsByStore)`, value: o.readings, unit: "ms", baseline: pass, baselineValue: o.readingsPass });
  record({ bench: "Today round", measure: `the same readings, warm (kept: each store compared row by row, none prepared again)`, value: o.keptReadings, unit: "ms", baseline: pass, baselineValue: o.readingsPass });
}

// 7. The farm's own history: one species' curve of days to first roots over 5,000 bags and 50,000 checks in the phone
// store (fake-indexeddb + lib/domain), the way the protocol page reads it, beside a plain scan of the same rows.

const HISTORY_BAGS = 5_000;
const HISTORY_CHECKS_PER_BAG = 10;

async function benchHistory() {
  const { RimebookDB } = await import("@/lib/client/db");
  const { loadSpeciesHistory } = await import("@/lib/client/history-reads");
  const { buildRootsHistory, groupChecksByBag } = await import("@/lib/domain/rows/farm-history-rows");
  const { addDaysToIsoDay, formatIsoDay } = await import("@/lib/domain/dates");
  const today = formatIsoDay(new Date());
  const stamp = { farm_id: "f", created_at: "2026-01-01T00:00:00.000Z", updated_at: "2026-01-01T00:00:00.000Z", seq: 1, deleted_at: null };
  const species = "Echinacea purpurea";
  const lotId = randomUUID();
  const bags = Array.from({ length: HISTORY_BAGS }, (_, i) => {
    const start = addDaysToIsoDay(today, -(60 + (i % 900)));
    return { ...stamp, id: randomUUID(), code: `H${String(i).padStart(6, "0")}`, lot_id: lotId, protocol_id: null, store_id: `store-${i % 3}`, box: `Box ${i % 4}`, medium: "paper_towel", seed_count: 50, start_date: start, planned_start_date: null, window_start: null, window_end: null, pulled_on: addDaysToIsoDay(start, 40), sown_on: null, discarded_on: null, discard_reason: null, trial_arm_id: null, plan_item_id: null, check_every_days: null, note: null };
  });
  // Ten checks a bag, four days apart; about four in five bags show roots at one of them (invented for the benchmark).
  const checks = bags.flatMap((b, i) =>
    Array.from({ length: HISTORY_CHECKS_PER_BAG }, (_, k) => ({
      ...stamp, id: randomUUID(), bag_id: b.id, checked_at: `${addDaysToIsoDay(b.start_date, 4 * (k + 1))}T09:00:00.000Z`, checked_by: null,
      moisture: k % 4 === 3 ? "dry" : "damp", mould: "clean", sprouts: i % 5 !== 0 && k >= 5 + (i % 4) ? "first_roots" : "none",
      actions: k % 4 === 3 ? ["added_water"] : [], note: null, temperature_c: null,
    })),
  );
  const phone = new RimebookDB(`bench-history-${randomUUID()}`);
  await phone.transaction("rw", [phone.lots, phone.bags, phone.checks], async () => {
    await phone.lots.put({ ...stamp, id: lotId, species, common_name: null, source: null, year: 2025, quantity: null, protocol_id: null, treated: false, notes: null } as never);
    await phone.bags.bulkPut(bags as never[]);
    await phone.checks.bulkPut(checks as never[]);
  });

  let medianDay: number | null = null;
  const curveFromStore = async () => {
    const rows = await loadSpeciesHistory(phone, species);
    medianDay = buildRootsHistory(rows, rows.checksByBag, { species }, null, today).window.median;
  };
  await curveFromStore();
  const full = median([await time(curveFromStore), await time(curveFromStore), await time(curveFromStore)]);
  // Baseline: a plain scan of the same rows (the species' bags, then every check once), counting roots in one pass.
  const plainScan = async () => {
    const ids = new Set((await phone.bags.where("lot_id").equals(lotId).toArray()).map((b) => b.id));
    let roots = 0;
    for (const c of await phone.checks.toArray()) if (ids.has(c.bag_id) && c.sprouts !== "none") roots++;
    return roots;
  };
  const scan = median([await time(plainScan), await time(plainScan), await time(plainScan)]);
  // The domain part alone, rows in memory, beside one pass over the same in-memory rows.
  const rows = await loadSpeciesHistory(phone, species);
  const rawChecks = await phone.checks.toArray();
  const domain = median([0, 1, 2, 3, 4].map(() => {
    const t = performance.now();
    buildRootsHistory(rows, groupChecksByBag(rawChecks), { species }, null, today);
    return performance.now() - t;
  }));
  const memScan = median([0, 1, 2, 3, 4].map(() => {
    const t = performance.now();
    let n = 0;
    for (const c of rawChecks) if (c.sprouts !== "none") n++;
    if (n < 0) throw new Error("unreachable");
    return performance.now() - t;
  }));
  phone.close();
  console.log(`  median day to first roots over ${HISTORY_BAGS.toLocaleString("en")} bags: ${medianDay}`);
  record({ bench: "Farm history", measure: `days-to-roots curve of one species, ${HISTORY_BAGS.toLocaleString("en")} bags and ${checks.length.toLocaleString("en")} checks from the phone store (Dexie read + lib/domain)`, value: full, unit: "ms", baseline: "plain scan of the same rows from the phone store", baselineValue: scan });
  record({ bench: "Farm history", measure: `the same curve, rows in memory (group checks by bag + Kaplan–Meier)`, value: domain, unit: "ms", baseline: "one pass over the same checks in memory", baselineValue: Math.max(memScan, 0.01) });
}


// 6. QR decode per 640×480 frame (@zxing/library in node) vs binarising the same frame.

async function benchQr() {
  const zx = (await import("@zxing/library")) as unknown as Record<string, any> & { default?: Record<string, any> };
  const { BinaryBitmap, HybridBinarizer, PlanarYUVLuminanceSource, QRCodeReader } = zx.default ?? zx;
  const { qrFrameLuma, FRAME_WIDTH: W, FRAME_HEIGHT: H } = await import("./qr-frame");
  const text = "https://rimebook.example/c/7K3Q9M-X";
  const luma = new Uint8ClampedArray(qrFrameLuma(text).buffer);
  const source = () => new PlanarYUVLuminanceSource(luma, W, H, 0, 0, W, H, false);
  const reader = new QRCodeReader();
  const decode = () => {
    const out = reader.decode(new BinaryBitmap(new HybridBinarizer(source())));
    if (out.getText() !== text) throw new Error("decoded the wrong text");
  };
  const binarize = () => new HybridBinarizer(source()).getBlackMatrix();
  for (let i = 0; i < 20; i++) decode(), binarize();
  const n = 100;
  const d = (await time(() => { for (let i = 0; i < n; i++) decode(); })) / n;
  const b = (await time(() => { for (let i = 0; i < n; i++) binarize(); })) / n;
  record({ bench: "QR decode", measure: `decode a label QR from one ${W}×${H} frame (mean of ${n})`, value: d, unit: "ms", baseline: "binarising the same frame only (HybridBinarizer)", baselineValue: b });
}

const ALL: Record<string, () => Promise<void>> = { push: benchPush, today: benchToday, history: benchHistory, qr: benchQr, pull: benchPull, firstload: benchFirstLoad, offline: benchOffline };

async function main() {
  const wanted = process.argv.slice(2).filter((a) => !a.startsWith("-"));
  const names = wanted.length ? wanted : Object.keys(ALL);
  console.log(`Rimebook benchmarks on ${os.cpus().length} × ${os.cpus()[0]?.model ?? "cpu"}, Node ${process.version}`);
  for (const name of names) {
    if (!ALL[name]) throw new Error(`unknown benchmark ${name}; choose from ${Object.keys(ALL).join(", ")}`);
    console.log(`\n▸ ${name}`);
    try {
      await ALL[name]();
    } catch (err) {
      failures.push(`${name}: ${(err as Error).message}`);
      console.log(`  ✗ ${(err as Error).message}`);
    }
  }
  await server?.stop();
  fs.rmSync(TMP, { recursive: true, force: true });

  const table = [
    "| benchmark | measure | result | baseline | baseline result | ratio |",
    "|---|---|---:|---|---:|---:|",
    ...rows.map((r) => `| ${r.bench} | ${r.measure} | ${fmt(r.value)} ${r.unit} | ${r.baseline} | ${fmt(r.baselineValue)} ${r.unit} | ×${r.ratio.toFixed(2)} |`),
  ].join("\n");
  console.log(`\n${table}\n`);
  if (notes.length) console.log(`Notes:\n${notes.map((f) => `  - ${f}`).join("\n")}`);
  if (failures.length) console.log(`Not measured:\n${failures.map((f) => `  - ${f}`).join("\n")}`);
  fs.mkdirSync(OUT, { recursive: true });
  const meta = { at: new Date().toISOString(), node: process.version, cpus: os.cpus().length, cpu: os.cpus()[0]?.model, load: os.loadavg() };
  fs.writeFileSync(path.join(OUT, "results.json"), JSON.stringify({ ...meta, rows, notes, failures }, null, 2));
  fs.writeFileSync(path.join(OUT, "results.md"), `${table}\n`);
  process.exit(failures.length ? 1 : 0);
}

main().catch((err) => {
  console.error(err);
  void server?.stop();
  process.exit(1);
});
