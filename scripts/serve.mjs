// `npm start`: serves the build through the front door (lib/server/front-door.mjs), so route handlers know the
// caller's real network address (rate limits, the local mailbox's loopback rule) and https sites send
// Strict-Transport-Security. `--dev` serves `next dev` the same way (npm run dev).
// Options as `next start`: -p PORT (or PORT, default 3000), -H HOST (or HOSTNAME, default every interface).
import http from "node:http";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { frontDoor, parseTrustProxy } from "../lib/server/front-door.mjs";

const args = process.argv.slice(2);
const option = (flag) => {
  const i = args.indexOf(flag);
  return i >= 0 ? args[i + 1] : undefined;
};
const dev = args.includes("--dev");
const port = Number(option("-p") ?? process.env.PORT ?? 3000);
const hostname = option("-H") ?? process.env.HOSTNAME ?? undefined;
process.env.NODE_ENV ??= dev ? "development" : "production";

let hops;
try {
  hops = parseTrustProxy(process.env.TRUST_PROXY);
} catch (err) {
  console.error(`Rimebook configuration is invalid:\n  ${err.message}`);
  process.exit(1);
}
const door = frontDoor({ hops, hsts: (process.env.APP_ORIGIN ?? "").startsWith("https://") });

const { default: next } = await import("next");
const app = next({ dev, turbopack: dev, dir: path.resolve(path.dirname(fileURLToPath(import.meta.url)), ".."), hostname: hostname ?? "localhost", port });
const handle = app.getRequestHandler();
await app.prepare();

const server = http.createServer((req, res) => {
  door(req, res);
  void handle(req, res);
});
if (dev) server.on("upgrade", app.getUpgradeHandler());
server.listen(port, hostname, () => {
  console.log(`▲ Rimebook ${dev ? "(dev) " : ""}listening on http://${hostname ?? "localhost"}:${port}${hops ? ` behind ${hops} trusted prox${hops === 1 ? "y" : "ies"}` : ""}`);
});

const stop = () => {
  server.close(() => process.exit(0));
  server.closeIdleConnections();
  setTimeout(() => process.exit(0), 3000).unref();
};
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
