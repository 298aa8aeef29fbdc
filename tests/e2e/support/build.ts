// One production build for the real-browser suite, in its own folder (.next-e2e) so it never fights a
// developer's `.next`. Built when missing or older than any source file; a lock lets parallel test files
// wait for a single build. CI builds it beforehand (`.ci/run`), so the suite finds it fresh and goes on.
import { spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { BUILD_CANARIES } from "../../../scripts/check-bundle-secrets";

export const ROOT = path.resolve(__dirname, "../../..");
export const E2E_DIST_DIR = process.env.E2E_DIST_DIR ?? ".next-e2e";
export const ARTIFACTS = path.join(ROOT, "artifacts", "e2e");

// Everything that goes into the build. Generated service-worker files in public/ are outputs, not inputs.
const SOURCES = ["app", "components", "lib", "sw", "public", "fonts", "db", "next.config.mjs", "security-headers.mjs", "postcss.config.mjs", "package.json", "package-lock.json", "tsconfig.json"];
const GENERATED = /^(sw(-[a-z0-9]+)?\.js|swe-worker-.*\.js)(\.map)?$/;

function newestMtime(p: string): number {
  let st: fs.Stats;
  try {
    st = fs.statSync(p);
  } catch {
    return 0;
  }
  if (!st.isDirectory()) return GENERATED.test(path.basename(p)) ? 0 : st.mtimeMs;
  let newest = 0;
  for (const entry of fs.readdirSync(p)) newest = Math.max(newest, newestMtime(path.join(p, entry)));
  return newest;
}

export function distPath(...parts: string[]): string {
  return path.join(ROOT, E2E_DIST_DIR, ...parts);
}

/** The build is usable when its BUILD_ID is newer than every source file. */
export function buildIsFresh(): boolean {
  const marker = distPath("BUILD_ID");
  if (!fs.existsSync(marker)) return false;
  // Local iteration: reuse whatever build exists (sources may be mid-edit by others).
  if (process.env.E2E_REUSE_BUILD === "1") return true;
  const built = fs.statSync(marker).mtimeMs;
  return SOURCES.every((s) => newestMtime(path.join(ROOT, s)) <= built);
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Ensures a fresh production build in E2E_DIST_DIR; returns its absolute path. */
export async function ensureBuild(): Promise<string> {
  if (buildIsFresh()) return distPath();
  const lock = path.join(ROOT, `${E2E_DIST_DIR}.lock`);
  for (;;) {
    try {
      fs.mkdirSync(lock);
      break;
    } catch {
      // Another test file is building; a lock older than 10 minutes is left over from a killed run.
      const age = Date.now() - (fs.statSync(lock, { throwIfNoEntry: false })?.mtimeMs ?? Date.now());
      if (age > 10 * 60_000) fs.rmSync(lock, { recursive: true, force: true });
      await sleep(1000);
      if (buildIsFresh()) return distPath();
    }
  }
  try {
    if (!buildIsFresh()) await runBuild();
  } finally {
    fs.rmSync(lock, { recursive: true, force: true });
  }
  return distPath();
}

async function runBuild(): Promise<void> {
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  const logFile = path.join(ARTIFACTS, "build.log");
  const log = fs.openSync(logFile, "w");
  fs.rmSync(distPath("BUILD_ID"), { force: true });
  const started = Date.now();
  const code = await new Promise<number | null>((resolve, reject) => {
    const child = spawn(process.execPath, ["node_modules/next/dist/bin/next", "build", "--webpack"], {
      cwd: ROOT,
      stdio: ["ignore", log, log],
      env: {
        ...process.env,
        ...BUILD_CANARIES,
        NODE_ENV: "production",
        NEXT_DIST_DIR: E2E_DIST_DIR,
        NEXT_TELEMETRY_DISABLED: "1",
        // Types are checked by `tsc --noEmit` on its own; the build need not do it twice.
        NEXT_SKIP_TYPECHECK: "1",
      },
    });
    child.on("error", reject);
    child.on("exit", resolve);
  });
  fs.closeSync(log);
  if (code !== 0) {
    const tail = fs.readFileSync(logFile, "utf8").split("\n").slice(-40).join("\n");
    throw new Error(`next build failed (exit ${code}); log in ${logFile}:\n${tail}`);
  }
  console.log(`[e2e] built ${E2E_DIST_DIR} in ${((Date.now() - started) / 1000).toFixed(0)} s`);
}
