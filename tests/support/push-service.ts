// A local fake Web Push service: an HTTP server on loopback that takes push messages as a real push service
// does (RFC 8030 POST to the subscription's endpoint), checks the VAPID Authorization header against the
// application server's public key (RFC 8292: `vapid t=<ES256 JWT>, k=<key>`, audience = this origin), decrypts
// the aes128gcm body with the subscriber's private key and auth secret (RFC 8291, the http_ece package) and
// records what arrived. Endpoints can be told to answer 410 (gone) or never to answer (a hung service).
import { createECDH, randomBytes, randomUUID } from "node:crypto";
import http from "node:http";
import type { AddressInfo } from "node:net";
import ece from "http_ece";
import { importJWK, jwtVerify } from "jose";

export type FakeSubscription = { endpoint: string; expirationTime: null; keys: { p256dh: string; auth: string } };

export type ArrivedPush = {
  endpointId: string;
  /** What the phone would read: the decrypted body, parsed as JSON when it is. */
  text: string;
  json: unknown;
  ttl: number;
  urgency: string | null;
  topic: string | null;
  at: string;
};

export type RefusedPush = { endpointId: string; status: number; reason: string };

type Endpoint = { ecdh: ReturnType<typeof createECDH>; auth: Buffer; answer: number | "hang" | null };

export type FakePushService = {
  origin: string;
  /** A new browser subscription pointing here, with keys only this fake (as the phone) can decrypt with. */
  createSubscription: () => FakeSubscription;
  /** From now on, this endpoint answers `status` (e.g. 410) or never answers ("hang"); null = normal. */
  answerWith: (endpoint: string, answer: number | "hang" | null) => void;
  arrived: ArrivedPush[];
  refused: RefusedPush[];
  /** Requests that reached the service, answered or not. */
  attempts: () => number;
  clear: () => void;
  close: () => Promise<void>;
};

const b64url = (b: Buffer) => b.toString("base64url");

/** Checks `Authorization: vapid t=…, k=…` (RFC 8292 §3); returns the reason it fails, or null. */
async function checkVapid(header: string | undefined, publicKey: string, audience: string): Promise<string | null> {
  const m = /^vapid\s+(.+)$/i.exec(header ?? "");
  if (!m) return "no vapid Authorization header";
  const params = Object.fromEntries(m[1].split(",").map((p) => p.trim().split(/=(.*)/s).slice(0, 2)));
  if (params.k !== publicKey) return "k is not the application server's public key";
  const raw = Buffer.from(publicKey, "base64url");
  if (raw.length !== 65 || raw[0] !== 4) return "k is not an uncompressed P-256 point";
  const key = await importJWK({ kty: "EC", crv: "P-256", x: b64url(raw.subarray(1, 33)), y: b64url(raw.subarray(33)) }, "ES256");
  try {
    const { payload } = await jwtVerify(params.t ?? "", key, { algorithms: ["ES256"], audience });
    if (typeof payload.exp !== "number" || payload.exp * 1000 > Date.now() + 24 * 3600_000) return "exp missing or more than 24 hours ahead";
    if (typeof payload.sub !== "string" || !/^(mailto:|https:)/.test(payload.sub)) return "sub is not a mailto: or https: contact";
  } catch (err) {
    return `JWT refused: ${(err as Error).message}`;
  }
  return null;
}

export async function startFakePushService(opts: { vapidPublicKey: string }): Promise<FakePushService> {
  const endpoints = new Map<string, Endpoint>();
  const arrived: ArrivedPush[] = [];
  const refused: RefusedPush[] = [];
  const hung = new Set<http.ServerResponse>();
  let attempts = 0;
  let origin = "";

  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      void (async () => {
        attempts++;
        const id = /^\/push\/([^/]+)$/.exec(req.url ?? "")?.[1] ?? "";
        const ep = endpoints.get(id);
        const refuse = (status: number, reason: string) => {
          refused.push({ endpointId: id, status, reason });
          res.writeHead(status, { "content-type": "text/plain" }).end(reason);
        };
        if (req.method !== "POST") return refuse(405, "POST only");
        if (!ep) return refuse(404, "no such subscription");
        if (ep.answer === "hang") return void hung.add(res);
        if (typeof ep.answer === "number") return refuse(ep.answer, "told to answer so");
        const vapid = await checkVapid(req.headers.authorization, opts.vapidPublicKey, origin);
        if (vapid) return refuse(401, vapid);
        const ttl = Number(req.headers.ttl);
        if (!Number.isInteger(ttl) || ttl < 0) return refuse(400, "TTL header missing");
        if (req.headers["content-encoding"] !== "aes128gcm") return refuse(415, "content-encoding must be aes128gcm");
        let text: string;
        try {
          text = ece.decrypt(Buffer.concat(chunks), { version: "aes128gcm", privateKey: ep.ecdh, authSecret: b64url(ep.auth) }).toString("utf8");
        } catch (err) {
          return refuse(400, `cannot decrypt: ${(err as Error).message}`);
        }
        let json: unknown = null;
        try {
          json = JSON.parse(text);
        } catch {
          /* a plain-text push */
        }
        arrived.push({
          endpointId: id,
          text,
          json,
          ttl,
          urgency: (req.headers.urgency as string) ?? null,
          topic: (req.headers.topic as string) ?? null,
          at: new Date().toISOString(),
        });
        res.writeHead(201, { location: `${origin}/message/${randomUUID()}` }).end();
      })();
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

  const idOf = (endpoint: string) => endpoint.slice(endpoint.lastIndexOf("/") + 1);
  return {
    origin,
    createSubscription() {
      const ecdh = createECDH("prime256v1");
      ecdh.generateKeys();
      const auth = randomBytes(16);
      const id = randomUUID();
      endpoints.set(id, { ecdh, auth, answer: null });
      return { endpoint: `${origin}/push/${id}`, expirationTime: null, keys: { p256dh: b64url(ecdh.getPublicKey()), auth: b64url(auth) } };
    },
    answerWith(endpoint, answer) {
      const ep = endpoints.get(idOf(endpoint));
      if (!ep) throw new Error(`no subscription ${endpoint}`);
      ep.answer = answer;
    },
    arrived,
    refused,
    attempts: () => attempts,
    clear() {
      arrived.length = 0;
      refused.length = 0;
      attempts = 0;
    },
    async close() {
      for (const res of hung) res.destroy();
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}

/** The endpoint id a subscription's messages are recorded under. */
export const endpointIdOf = (s: { endpoint: string }) => s.endpoint.slice(s.endpoint.lastIndexOf("/") + 1);
