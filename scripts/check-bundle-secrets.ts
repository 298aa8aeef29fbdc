// Scans what a browser can download from a production build (client chunks, prerendered HTML and RSC payloads,
// public/ including the service worker) for secrets and server-only names.
//   npx tsx scripts/check-bundle-secrets.ts [distDir]      (exit 1 on any finding)
// The e2e suite builds with BUILD_CANARIES as SESSION_SECRET and CRON_SECRET so a leak of a build-time
// secret is caught even though real secrets are only given at run time.
import fs from "node:fs";
import path from "node:path";

export const BUILD_CANARIES = {
  SESSION_SECRET: "bundle-canary-session-secret-7d2f0c94b15e4a8b9e61",
  CRON_SECRET: "bundle-canary-cron-secret-3a9e51d7c0f2",
} as const;

export type Finding = { file: string; needle: string; reason: string; excerpt: string };
type Needle = { text: string; reason: string };

/** Server env names and dev-default secrets, read from lib/server/env.ts so the list follows the code. */
export function needlesFrom(root: string, extraSecrets: Record<string, string | undefined> = {}): Needle[] {
  const needles: Needle[] = [{ text: "password_hash", reason: "password hash column name" }];
  const envSource = fs.readFileSync(path.join(root, "lib/server/env.ts"), "utf8");
  for (const m of envSource.matchAll(/^\s+([A-Z][A-Z0-9_]+):\s*z\./gm)) {
    if (m[1] !== "NODE_ENV") needles.push({ text: m[1], reason: "server environment variable name" });
  }
  for (const m of envSource.matchAll(/"(rimebook-development-[^"]+)"/g)) needles.push({ text: m[1], reason: "development default secret" });
  for (const [name, value] of Object.entries({ ...BUILD_CANARIES, ...extraSecrets })) {
    if (value && value.length >= 8) needles.push({ text: value, reason: `value of ${name}` });
  }
  return needles;
}

const CLIENT_EXT = /\.(js|mjs|css|html|rsc|body|json|txt|map|webmanifest|svg)$/;

/** Files a browser can receive: everything under static/, prerendered pages, and public/. */
export function clientFiles(root: string, distDir: string): string[] {
  const out: string[] = [];
  const walk = (dir: string, keep: (f: string) => boolean) => {
    if (!fs.existsSync(dir)) return;
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(p, keep);
      else if (keep(p)) out.push(p);
    }
  };
  walk(path.join(distDir, "static"), (f) => CLIENT_EXT.test(f));
  // Prerendered HTML and flight payloads are sent as they are; the server's own JS there is not.
  walk(path.join(distDir, "server", "app"), (f) => /\.(html|rsc|body)$/.test(f));
  walk(path.join(distDir, "server", "pages"), (f) => f.endsWith(".html"));
  walk(path.join(root, "public"), () => true);
  return out;
}

export function scanFiles(files: string[], needles: Needle[]): Finding[] {
  const findings: Finding[] = [];
  for (const file of files) {
    const text = fs.readFileSync(file, "latin1");
    for (const n of needles) {
      const at = text.indexOf(n.text);
      if (at >= 0) findings.push({ file, needle: n.text, reason: n.reason, excerpt: text.slice(Math.max(0, at - 60), at + n.text.length + 60) });
    }
  }
  return findings;
}

export function scanBuild(root: string, distDir: string): { files: number; findings: Finding[] } {
  const files = clientFiles(root, distDir);
  if (!files.some((f) => f.includes(`${path.sep}static${path.sep}`))) throw new Error(`no client chunks under ${distDir}/static: build first`);
  const needles = needlesFrom(root, { SESSION_SECRET: process.env.SESSION_SECRET, CRON_SECRET: process.env.CRON_SECRET });
  return { files: files.length, findings: scanFiles(files, needles) };
}

if (process.argv[1]?.endsWith("check-bundle-secrets.ts")) {
  const root = process.cwd();
  const distDir = path.resolve(process.argv[2] ?? process.env.NEXT_DIST_DIR ?? ".next");
  const { files, findings } = scanBuild(root, distDir);
  for (const f of findings) console.error(`✗ ${path.relative(root, f.file)}: ${f.reason} "${f.needle}" … ${JSON.stringify(f.excerpt)}`);
  console.log(`${files} client files scanned in ${path.relative(root, distDir)}: ${findings.length ? `${findings.length} finding(s)` : "no secrets found"}`);
  process.exit(findings.length ? 1 : 0);
}
