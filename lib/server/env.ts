import "server-only";
import { z } from "zod";

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
  })
  .transform((env, ctx) => {
    // `next build` loads route modules to collect page data; the secret is only needed when serving.
    const building = process.env.NEXT_PHASE === "phase-production-build";
    const production = env.NODE_ENV === "production" && !building;
    if (production && !env.SESSION_SECRET) {
      ctx.addIssue({ code: "custom", path: ["SESSION_SECRET"], message: "SESSION_SECRET is required in production" });
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
