import http from "node:http";
import type { AddressInfo } from "node:net";
import { afterEach, describe, expect, it } from "vitest";
import { CLIENT_HEADER, HSTS_VALUE, clientAddressOf, frontDoor, isLoopback, parseTrustProxy } from "@/lib/server/front-door.mjs";

// The front door (scripts/serve.mjs) reads the caller's address from the socket, believing X-Forwarded-For
// only as far as TRUST_PROXY says, and adds Strict-Transport-Security on https sites. Tried on a real
// node:http server over loopback, the way `npm start` runs it.

let server: http.Server | null = null;
afterEach(() => new Promise<void>((r) => (server ? server.close(() => r()) : r())));

async function serve(opts: { hops?: number; hsts?: boolean }): Promise<string> {
  const door = frontDoor(opts);
  server = http.createServer((req, res) => {
    door(req, res);
    res.setHeader("content-type", "application/json");
    res.end(JSON.stringify({ client: req.headers[CLIENT_HEADER] }));
  });
  await new Promise<void>((r) => server!.listen(0, "127.0.0.1", () => r()));
  return `http://127.0.0.1:${(server!.address() as AddressInfo).port}`;
}

describe("front door", () => {
  it("with no trusted proxy, the socket's address wins over anything the caller wrote", async () => {
    const url = await serve({});
    const res = await fetch(url, { headers: { "x-forwarded-for": "203.0.113.9", [CLIENT_HEADER]: "203.0.113.10" } });
    expect(await res.json()).toEqual({ client: "127.0.0.1" });
    expect(res.headers.get("strict-transport-security")).toBeNull();
  });

  it("with TRUST_PROXY=1, the entry our proxy appended (the last one), never the caller's own entries", async () => {
    const url = await serve({ hops: 1 });
    const res = await fetch(url, { headers: { "x-forwarded-for": "10.0.0.1, 198.51.100.4" } });
    expect(await res.json()).toEqual({ client: "198.51.100.4" });
  });

  it("sends Strict-Transport-Security when the origin is https", async () => {
    const url = await serve({ hsts: true });
    expect((await fetch(url)).headers.get("strict-transport-security")).toBe(HSTS_VALUE);
  });

  it.each([
    ["127.0.0.1", undefined, 0, "127.0.0.1"],
    ["::ffff:192.0.2.1", "10.0.0.1", 0, "192.0.2.1"],
    ["10.0.0.2", "203.0.113.1, 192.0.2.7", 1, "192.0.2.7"],
    ["10.0.0.2", "203.0.113.1, 192.0.2.7", 2, "203.0.113.1"],
    ["10.0.0.2", undefined, 3, "10.0.0.2"], // fewer entries than proxies: the furthest we have
  ] as const)("socket %s, X-Forwarded-For %s, %i trusted → %s", (remote, forwarded, hops, expected) => {
    expect(clientAddressOf(remote, forwarded, hops)).toBe(expected);
  });

  it("reads TRUST_PROXY as a small whole number and refuses anything else", () => {
    expect(parseTrustProxy(undefined)).toBe(0);
    expect(parseTrustProxy("2")).toBe(2);
    for (const bad of ["yes", "-1", "1.5", "true"]) expect(() => parseTrustProxy(bad)).toThrow(/TRUST_PROXY/);
  });

  it("knows loopback", () => {
    for (const a of ["127.0.0.1", "127.8.9.1", "::1", "::ffff:127.0.0.1"]) expect(isLoopback(a)).toBe(true);
    for (const a of ["192.168.1.5", "10.0.0.1", "::", "", null, "fe80::1"]) expect(isLoopback(a)).toBe(false);
  });
});
