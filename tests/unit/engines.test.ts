import fs from "node:fs";
import path from "node:path";
import { createRequire } from "node:module";
import { describe, expect, it } from "vitest";

// `npm ci` warns EBADENGINE when an installed package's "engines.node" does not accept the Node that installs it.
// The project promises Node >= 20 (package.json), and CI and this machine run Node 20: every package that lands in
// node_modules must accept the Node running the tests. (@zxing/library 0.23.0 asked for Node >= 24, although it
// only ever runs in the browser here; 0.21.3 with @zxing/browser 0.1.5 asks for >= 10.4 and decodes the same codes.)

const require = createRequire(import.meta.url);
const semver = require("semver") as { satisfies(version: string, range: string): boolean };

type LockEntry = { engines?: Record<string, string> | string[]; optional?: boolean };

describe("installed packages accept this Node (no EBADENGINE at npm ci)", () => {
  const lock = JSON.parse(fs.readFileSync(path.resolve("package-lock.json"), "utf8")) as { packages: Record<string, LockEntry> };

  it("the project's own promise is Node >= 20", () => {
    expect(lock.packages[""].engines).toEqual({ node: ">=20" });
  });

  it(`every installed package's engines.node accepts ${process.version}`, () => {
    const refused: string[] = [];
    for (const [where, entry] of Object.entries(lock.packages)) {
      if (!where || Array.isArray(entry.engines) || !entry.engines?.node) continue;
      // Optional platform packages for other systems are never installed here, so npm never checks them.
      if (!fs.existsSync(path.resolve(where, "package.json"))) continue;
      if (!semver.satisfies(process.version, entry.engines.node)) refused.push(`${where} wants node ${entry.engines.node}`);
    }
    expect(refused).toEqual([]);
  });
});
