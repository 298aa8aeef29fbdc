import http from "node:http";
import { randomUUID } from "node:crypto";
import { gunzipSync } from "node:zlib";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startApp, type AppServer } from "./support/server";

// The pull answer on the wire from the production build: gzip-compressed once (by the framework's compression,
// Node zlib) when the phone accepts it, the same JSON once decompressed, with Content-Encoding and Vary right.
// A route handler that compressed on its own would be compressed twice (Next drops its Content-Encoding).

let app: AppServer;
let cookie = "";

function get(path: string, headers: Record<string, string>): Promise<{ headers: http.IncomingHttpHeaders; body: Buffer }> {
  return new Promise((resolve, reject) => {
    http
      .get(`${app.origin}${path}`, { headers: { cookie, ...headers } }, (res) => {
        const chunks: Buffer[] = [];
        res.on("data", (d: Buffer) => chunks.push(d));
        res.on("end", () => resolve({ headers: res.headers, body: Buffer.concat(chunks) }));
      })
      .on("error", reject);
  });
}

beforeAll(async () => {
  app = await startApp({ name: "pull-gzip" });
  const res = await fetch(`${app.origin}/api/auth/sign-up`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: app.origin },
    body: JSON.stringify({ email: "gzip@bramblewick.example", password: "frost on the barn door", name: "Wren Hollis", farmName: "Bramblewick Native Nursery" }),
  });
  expect([200, 201]).toContain(res.status);
  cookie = res.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
  const mutations = Array.from({ length: 40 }, (_, i) => ({ id: randomUUID(), name: "lot.create", args: { id: randomUUID(), species: `Echinacea pallida ${i}`, year: 2025 }, at: new Date().toISOString() }));
  const pushed = await fetch(`${app.origin}/api/sync/push`, { method: "POST", headers: { "content-type": "application/json", origin: app.origin, cookie }, body: JSON.stringify({ deviceId: "gzip-phone", mutations }) });
  expect(pushed.status).toBe(200);
}, 300_000);

afterAll(async () => {
  await app?.stop();
});

describe("the pull answer on the wire", () => {
  it("is gzip once when accepted, the same JSON once decompressed, with Content-Encoding and Vary", async () => {
    const path = "/api/sync/pull?since=0&limit=100";
    const plain = await get(path, {});
    expect(plain.headers["content-encoding"]).toBeUndefined();
    const json = JSON.parse(plain.body.toString("utf8"));
    expect(json.changes.filter((c: { table: string }) => c.table === "lots")).toHaveLength(40);

    const packed = await get(path, { "accept-encoding": "gzip, deflate, br" });
    expect(packed.headers["content-encoding"]).toBe("gzip");
    expect(String(packed.headers.vary)).toMatch(/accept-encoding/i);
    expect(packed.headers["content-type"]).toMatch(/^application\/json/);
    const unpacked = gunzipSync(packed.body);
    // Compressed exactly once: the decompressed bytes are the JSON itself, not another gzip stream.
    expect(unpacked.subarray(0, 2).toString("hex")).not.toBe("1f8b");
    expect(JSON.parse(unpacked.toString("utf8"))).toEqual(json);
    expect(packed.body.length).toBeLessThan(plain.body.length / 3);

    const refused = await get(path, { "accept-encoding": "gzip;q=0" });
    expect(refused.headers["content-encoding"]).toBeUndefined();
    expect(JSON.parse(refused.body.toString("utf8"))).toEqual(json);
  });
});
