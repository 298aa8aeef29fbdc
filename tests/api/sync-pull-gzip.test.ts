import { gunzipSync } from "node:zlib";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { uuid } from "../support/sync";
import { POST as push } from "@/app/api/sync/push/route";
import { GET as pull } from "@/app/api/sync/pull/route";
import { acceptsGzip } from "@/lib/server/http";

// The pull answer travels gzip-compressed when the phone accepts it, and is the same JSON once decompressed.

const ctx = { params: Promise.resolve({}) };

describe("sync pull compression", () => {
  let t: Awaited<ReturnType<typeof freshDatabase>>;
  let owner: TestMember;
  beforeAll(async () => {
    t = await freshDatabase();
    owner = await signedInMember(t.db, { role: "owner" });
    const lots = Array.from({ length: 30 }, (_, i) => ({ id: uuid(), name: "lot.create", args: { id: uuid(), species: `Echinacea pallida ${i}`, year: 2025 }, at: "2026-11-20T08:00:00.000Z" }));
    const res = await push(memberRequest("/api/sync/push", owner, { method: "POST", json: { deviceId: "phone-1", mutations: lots.map((m) => ({ ...m, id: uuid() })) } }), ctx);
    expect((await res.json()).rejected).toEqual([]);
  });
  afterAll(async () => t.cleanup());

  const pullWith = (acceptEncoding: string | null) =>
    pull(memberRequest("/api/sync/pull?since=0&limit=100", owner, { headers: acceptEncoding === null ? {} : { "accept-encoding": acceptEncoding } }), ctx);

  it("sends gzip when accepted, the same JSON once decompressed, with Content-Encoding, Content-Length and Vary", async () => {
    const plain = await pullWith(null);
    expect(plain.status).toBe(200);
    expect(plain.headers.get("content-encoding")).toBeNull();
    expect(plain.headers.get("vary")).toMatch(/accept-encoding/i);
    const plainBytes = Buffer.from(await plain.arrayBuffer());

    const packed = await pullWith("gzip, deflate, br");
    expect(packed.status).toBe(200);
    expect(packed.headers.get("content-encoding")).toBe("gzip");
    expect(packed.headers.get("vary")).toMatch(/accept-encoding/i);
    expect(packed.headers.get("content-type")).toBe("application/json");
    expect(packed.headers.get("cache-control")).toBe("no-store");
    const bytes = Buffer.from(await packed.arrayBuffer());
    expect(Number(packed.headers.get("content-length"))).toBe(bytes.length);
    expect(bytes.length).toBeLessThan(plainBytes.length / 3);
    const unpacked = gunzipSync(bytes).toString("utf8");
    expect(unpacked).toBe(plainBytes.toString("utf8"));
    expect(JSON.parse(unpacked).changes.filter((c: { table: string }) => c.table === "lots")).toHaveLength(30);
  });

  it("sends plain JSON when gzip is refused or not offered", async () => {
    for (const header of ["gzip;q=0", "identity", "br", "*;q=0"]) {
      const res = await pullWith(header);
      expect(res.headers.get("content-encoding"), header).toBeNull();
      expect(JSON.parse(Buffer.from(await res.arrayBuffer()).toString("utf8")).changes.length).toBeGreaterThan(30);
    }
  });

  it("reads Accept-Encoding as HTTP does", () => {
    expect(acceptsGzip("gzip")).toBe(true);
    expect(acceptsGzip("GZIP;q=0.5, br")).toBe(true);
    expect(acceptsGzip("*")).toBe(true);
    expect(acceptsGzip("br, *;q=0.1")).toBe(true);
    expect(acceptsGzip("gzip;q=0, *")).toBe(false);
    expect(acceptsGzip("gzip; q=0.0")).toBe(false);
    expect(acceptsGzip(null)).toBe(false);
    expect(acceptsGzip("deflate, br")).toBe(false);
  });
});
