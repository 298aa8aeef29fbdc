import "server-only";
import { z } from "zod";

/** An empty value (`VAPID_PRIVATE_KEY=` in a compose file) means unset: reminders off, not a broken start. */
const emptyAsUnset = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

/** Who push services may contact about our messages: the app's https address, else the sender's mailbox. */
function vapidSubjectFor(origin: string, mailFrom: string): string {
  if (origin.startsWith("https://")) return new URL(origin).origin;
  const address = /<([^>]+)>/.exec(mailFrom)?.[1] ?? mailFrom;
  return `mailto:${address.includes("@") ? address.trim() : "rimebook@localhost"}`;
}

// Read once, validated; defaults serve the demo on the embedded SQLite file.
const EnvSchema = z
  .object({
    NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
    DATABASE_URL: z.string().min(1).default("file:data/rimebook.sqlite"),
    SESSION_SECRET: z.string().min(32, "SESSION_SECRET must be at least 32 characters").optional(),
    APP_ORIGIN: z.string().url().default("http://localhost:3000"),
    SMTP_URL: z.string().min(1).default("smtp://127.0.0.1:2525"),
    MAIL_FROM: z.string().min(3).default("Rimebook <rimebook@localhost>"),
    UPLOAD_DIR: z.string().min(1).default("data/uploads"),
    CRON_SECRET: z.string().min(8).optional(),
    // The local mailbox page: on only when the demo or dev asks (MAILBOX_PAGE=on), and then only for this
    // computer itself unless MAILBOX_PAGE_REMOTE=on too. Never on from the origin's scheme.
    MAILBOX_PAGE: z.enum(["on", "off"]).optional(),
    MAILBOX_PAGE_REMOTE: z.enum(["on", "off"]).optional(),
    MAILBOX_DIR: z.string().min(1).default("data/mailbox"), // where the local SMTP fake stores captured mail
    // Web Push (RFC 8292 VAPID): without the pair, phone reminders are off and Settings says so.
    VAPID_PUBLIC_KEY: z.preprocess(
      emptyAsUnset,
      z.string().trim().regex(/^[A-Za-z0-9_-]{87}$/, "VAPID_PUBLIC_KEY must be the URL-safe base64 of a 65-byte P-256 public key (npx web-push generate-vapid-keys)").optional(),
    ),
    VAPID_PRIVATE_KEY: z.preprocess(
      emptyAsUnset,
      z.string().trim().regex(/^[A-Za-z0-9_-]{43}$/, "VAPID_PRIVATE_KEY must be the URL-safe base64 of a 32-byte P-256 private key").optional(),
    ),
    VAPID_SUBJECT: z.preprocess(
      emptyAsUnset,
      z.string().trim().regex(/^(mailto:[^\s@]+@[^\s@]+|https:\/\/\S+)$/, "VAPID_SUBJECT must be a mailto: address or an https: URL where push services can reach you").optional(),
    ),
    // The local fake push service in tests and the demo listens on loopback over http; real ones are https.
    PUSH_ALLOW_LOOPBACK: z.enum(["on", "off"]).default("off"),
  })
  .transform((env, ctx) => {
    // `next build` loads route modules to collect page data; the secret is only needed when serving.
    const building = process.env.NEXT_PHASE === "phase-production-build";
    const production = env.NODE_ENV === "production" && !building;
    if (production && !env.SESSION_SECRET) {
      ctx.addIssue({ code: "custom", path: ["SESSION_SECRET"], message: "SESSION_SECRET is required in production" });
      return z.NEVER;
    }
    if (!!env.VAPID_PUBLIC_KEY !== !!env.VAPID_PRIVATE_KEY) {
      ctx.addIssue({ code: "custom", path: ["VAPID_PRIVATE_KEY"], message: "Set both VAPID_PUBLIC_KEY and VAPID_PRIVATE_KEY, or neither (phone reminders off)" });
      return z.NEVER;
    }
    return {
      ...env,
      SESSION_SECRET: env.SESSION_SECRET ?? "rimebook-development-secret-not-for-production-use",
      // Production without a secret: the digest route is switched off (null), never opened by a known value.
      // `npm run demo` makes its own secret in data/.cron-secret.
      CRON_SECRET: env.CRON_SECRET ?? (production ? null : "rimebook-development-cron"),
      secureCookies: env.APP_ORIGIN.startsWith("https://"),
      mailboxPage: env.MAILBOX_PAGE === "on",
      mailboxRemote: env.MAILBOX_PAGE_REMOTE === "on",
      vapid:
        env.VAPID_PUBLIC_KEY && env.VAPID_PRIVATE_KEY
          ? { publicKey: env.VAPID_PUBLIC_KEY, privateKey: env.VAPID_PRIVATE_KEY, subject: env.VAPID_SUBJECT ?? vapidSubjectFor(env.APP_ORIGIN, env.MAIL_FROM) }
          : null,
      // Never on an https deployment: it would let a subscription point the server at its own loopback ports.
      pushAllowLoopback: env.PUSH_ALLOW_LOOPBACK === "on" && !env.APP_ORIGIN.startsWith("https://"),
    };
  });

export type Env = z.infer<typeof EnvSchema>;

function readEnv(): Env {
  const parsed = EnvSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`).join("\n");
    throw new Error(`Rimebook configuration is invalid:\n${lines}`);
  }
  return parsed.data;
}

export const env: Env = readEnv();
