// A second app process for tests: pushes mutations through the real push route handler with its own
// knex pool on DATABASE_URL, as another server process behind the same database would. Reads one JSON
// job from the file named by argv[2] ({ cookie, origin, deviceId, startAt, batches }), waits until `startAt` (ms since the epoch)
// so two workers begin together, and prints the answers as one JSON line.
import fs from "node:fs";
import { POST } from "@/app/api/sync/push/route";
import { getDb } from "@/lib/server/db";

type Job = { cookie: string; origin: string; deviceId: string; startAt: number; batches: unknown[][] };

async function main() {
  const job = JSON.parse(fs.readFileSync(process.argv[2], "utf8")) as Job;
  await getDb().raw("select 1"); // connect before the start line
  await new Promise((r) => setTimeout(r, Math.max(0, job.startAt - Date.now())));
  const answers: { status: number; body: unknown }[] = [];
  for (const mutations of job.batches) {
    const req = new Request(new URL("/api/sync/push", job.origin), {
      method: "POST",
      headers: { cookie: job.cookie, origin: job.origin, "content-type": "application/json" },
      body: JSON.stringify({ deviceId: job.deviceId, mutations }),
    });
    const res = await POST(req, { params: Promise.resolve({}) });
    answers.push({ status: res.status, body: await res.json() });
  }
  process.stdout.write(`${JSON.stringify(answers)}\n`);
  await getDb().destroy();
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
