import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember } from "../support/auth";
import { GET } from "@/app/api/bench/floor/route";

// The benchmark's framework floor must not exist in production: without RIMEBOOK_BENCH_FLOOR_FILE it is a 404.
describe("GET /api/bench/floor", () => {
  let ctx: Awaited<ReturnType<typeof freshDatabase>>;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-floor-"));
  const file = path.join(dir, "pull.json");
  const body = { cursor: 3, changes: [{ table: "lots", row: { id: "l1", species: "Asclepias tuberosa" } }], more: false, head: 3 };
  beforeAll(async () => {
    ctx = await freshDatabase();
    fs.writeFileSync(file, JSON.stringify(body));
  });
  afterEach(() => {
    delete process.env.RIMEBOOK_BENCH_FLOOR_FILE;
  });
  afterAll(async () => {
    await ctx.cleanup();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it("is not found unless the server was started for the benchmark", async () => {
    delete process.env.RIMEBOOK_BENCH_FLOOR_FILE;
    const res = await GET(new Request("http://localhost/api/bench/floor"), {});
    expect(res.status).toBe(404);
    expect((await res.json()).error.code).toBe("not_found");
    const withSession = await GET(new Request("http://localhost/api/bench/floor?session=1"), {});
    expect(withSession.status).toBe(404);
  });

  it("answers the benchmark's JSON when started for it, and checks the session only when asked", async () => {
    process.env.RIMEBOOK_BENCH_FLOOR_FILE = file;
    const res = await GET(new Request("http://localhost/api/bench/floor"), {});
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual(body);
    expect((await GET(new Request("http://localhost/api/bench/floor?session=1"), {})).status).toBe(401);
    const member = await signedInMember(ctx.db, { role: "owner" });
    const signedIn = await GET(memberRequest("/api/bench/floor?session=1", member), {});
    expect(signedIn.status).toBe(200);
    expect(await signedIn.json()).toEqual(body);
  });
});
