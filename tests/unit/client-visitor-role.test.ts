import "fake-indexeddb/auto";
import { describe, expect, it } from "vitest";
import { RimebookDB, setLocalDb } from "@/lib/client/db";
import { loadIdentity } from "@/lib/client/identity";
import { META, writeMeta } from "@/lib/client/meta";
import { createLot, setDigestOptIn } from "@/lib/client/repo";

// A phone that last synced before the read-only role was renamed still has "viewer" in its stored
// identity (Dexie meta). It reads it as a Visitor, shows it as one, and is allowed exactly what a
// Visitor is allowed, until the next pull brings the server's word.

async function phoneFromBeforeTheRename() {
  const db = new RimebookDB(`unit-${crypto.randomUUID()}`);
  setLocalDb(db);
  await writeMeta(db, META.identity, {
    user: { id: "user-1", name: "Juniper", email: "juniper@example.test" },
    farm: { id: "farm-1", name: "Bramblewick" },
    role: "viewer",
    farms: [
      { id: "farm-1", name: "Bramblewick", role: "viewer" },
      { id: "farm-2", name: "Hillside", role: "helper" },
    ],
  });
  return db;
}

describe("a phone that stored the old role 'viewer'", () => {
  it("reads itself (and its other farms) as a Visitor", async () => {
    const db = await phoneFromBeforeTheRename();
    const identity = await loadIdentity(db);
    expect(identity?.role).toBe("visitor");
    expect((identity as unknown as { farms: { role: string }[] }).farms.map((f) => f.role)).toEqual(["visitor", "helper"]);
  });

  it("may still change its own digest setting, and nothing else", async () => {
    const db = await phoneFromBeforeTheRename();
    await setDigestOptIn(true);
    await expect(createLot({ species: "Viola pedata" })).rejects.toMatchObject({ code: "forbidden" });
    expect((await db.outbox.toArray()).map((e) => e.name)).toEqual(["member.preferences"]);
  });

  it("reads a role it does not know as the least one", async () => {
    const db = new RimebookDB(`unit-${crypto.randomUUID()}`);
    setLocalDb(db);
    await writeMeta(db, META.identity, { user: { id: "u", name: "N", email: "n@example.test" }, farm: { id: "f", name: "F" }, role: "superuser" });
    expect((await loadIdentity(db))?.role).toBe("visitor");
  });
});
