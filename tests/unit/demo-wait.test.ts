import http from "node:http";
import type { AddressInfo } from "node:net";
import { afterEach, describe, expect, it } from "vitest";
import { waitForApp } from "../../scripts/wait-for-app";

// `npm run demo` prints its sign-in banner only once the app answers: a real HTTP server that starts listening late
// and answers 503 before it is ready.

let server: http.Server | null = null;
afterEach(() => new Promise<void>((r) => (server ? server.close(() => r()) : r())));

const freePort = () =>
  new Promise<number>((resolve) => {
    const s = http.createServer().listen(0, "127.0.0.1", () => {
      const { port } = s.address() as AddressInfo;
      s.close(() => resolve(port));
    });
  });

describe("waitForApp", () => {
  it("resolves only after the app listens and answers 2xx", async () => {
    const port = await freePort();
    let readyAt = Infinity;
    const started = Date.now();
    setTimeout(() => {
      server = http
        .createServer((_req, res) => {
          const ready = Date.now() >= readyAt;
          res.writeHead(ready ? 200 : 503).end(ready ? '{"ok":true}' : "starting");
        })
        .listen(port, "127.0.0.1");
      readyAt = Date.now() + 300; // listening, but still starting for 300 ms
    }, 300);
    expect(await waitForApp(`http://127.0.0.1:${port}/api/health`, { intervalMs: 50, timeoutMs: 10_000 })).toBe(true);
    expect(Date.now() - started).toBeGreaterThanOrEqual(600);
  });

  it("gives up when the server process exited, and after the timeout", async () => {
    const port = await freePort();
    expect(await waitForApp(`http://127.0.0.1:${port}/`, { intervalMs: 20, gaveUp: () => true })).toBe(false);
    const t = Date.now();
    expect(await waitForApp(`http://127.0.0.1:${port}/`, { intervalMs: 20, timeoutMs: 200 })).toBe(false);
    expect(Date.now() - t).toBeLessThan(2_000);
  });
});
