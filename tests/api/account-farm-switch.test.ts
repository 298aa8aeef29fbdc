// Switching farms on a phone (fake IndexedDB) through the real route handlers: waiting work is sent to
// the farm it was recorded on before the switch, the switch is refused in words while anything of the
// current farm is still only on the phone, and afterwards the phone holds only the new farm's rows.
import { afterAll, beforeAll, afterEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { freshDatabase } from "../support/db";
import { signedInMember, type TestMember } from "../support/auth";
import { openPhone, origin, routedFetch, type Phone } from "../support/sync";
import { addMembership } from "@/lib/server/accounts";
import { SESSION_COOKIE } from "@/lib/server/sessions";
import { POST as switchRoute } from "@/app/api/me/farm/route";
import { createLot } from "@/lib/client/repo";
import { countLeftBehind, switchFarm, type LeftBehind } from "@/lib/client/farm-switch";
import { loadIdentity } from "@/lib/client/identity";
import { describeLeftBehind } from "@/components/settings/account-words";

/** A browser's cookie jar in front of the route handlers: the switch answer replaces the session cookie. */
function browser(member: TestMember) {
  const state = { cookie: member.cookie, online: true };
  const f: typeof fetch = async (input, init) => {
    if (!state.online) throw new TypeError("fetch failed");
    const url = new URL(typeof input === "string" ? input : input instanceof URL ? input.href : input.url, origin);
    let res: Response;
    if (url.pathname === "/api/me/farm") {
      const headers = new Headers(init?.headers);
      headers.set("cookie", state.cookie);
      headers.set("origin", origin);
      res = await switchRoute(new Request(url, { ...init, headers }), {} as never);
    } else {
      res = await routedFetch({ cookie: state.cookie })(input, init);
    }
    const set = /rimebook_session=([^;]+)/.exec(res.headers.get("set-cookie") ?? "");
    if (set) state.cookie = `${SESSION_COOKIE}=${set[1]}`;
    return res;
  };
  return { state, fetch: f };
}

let t: Awaited<ReturnType<typeof freshDatabase>>;
let db: Knex;
let grower: TestMember;
let farmB: string;
let phone: Phone;
let net: ReturnType<typeof browser>;

const lotsOn = (farmId: string) => db("lots").where({ farm_id: farmId }).select("id", "species");

beforeAll(async () => {
  t = await freshDatabase();
  db = t.db;
  grower = await signedInMember(db, { role: "grower", farmName: "Bramblewick Native Nursery" });
  const ownerB = await signedInMember(db, { role: "owner", farmName: "Quill Seed Library" });
  farmB = ownerB.farmId;
  await db.transaction((trx) => addMembership(trx, { farmId: farmB, userId: grower.userId, role: "helper" }));
  // Farm B already has a lot of its own, recorded on its Owner's phone.
  const ownerPhone = await openPhone(ownerB);
  await createLot({ species: "Asclepias tuberosa", year: 2025 });
  await ownerPhone.engine.syncNow();
  expect(await lotsOn(farmB)).toHaveLength(1);

  phone = await openPhone(grower);
  net = browser(grower);
  phone.net.fetch = net.fetch;
  await phone.engine.syncNow();
});
// A refused switch starts the loop again: stop it and let its run finish before the next step.
afterEach(async () => {
  phone.engine.stop();
  await phone.engine.syncNow();
});
afterAll(async () => t.cleanup());

const opts = () => ({ fetch: net.fetch, baseUrl: origin, db: phone.db, engine: phone.engine });
const serverFarmOf = async () => (await routedFetch({ cookie: net.state.cookie })(`${origin}/api/me`).then((r) => r.json())).farm.id;

describe("switching farms on the phone", () => {
  it("refuses with no signal while a change waits, keeping the change, the rows and the session as they were", async () => {
    phone.use();
    const lot = await createLot({ species: "Baptisia australis", year: 2025 });
    net.state.online = false;
    const result = await switchFarm(farmB, opts());
    expect(result).toEqual({ ok: false, reason: "unsent", farmName: "Bramblewick Native Nursery", left: { pending: 1, refused: 0, photos: 0, waiting: { records: 1, photos: 0, parts: [{ name: "lot.create", n: 1 }] } } });
    expect(await phone.db.lots.get(lot.id)).toBeTruthy();
    expect(await phone.db.outbox.where("status").equals("pending").count()).toBe(1);
    expect((await loadIdentity(phone.db))?.farm.id).toBe(grower.farmId);
    net.state.online = true;
    expect(await serverFarmOf()).toBe(grower.farmId);
    expect(await lotsOn(farmB)).toHaveLength(1); // nothing went to the other farm
  });

  it("refuses while a refused change or a photo of this farm is on the phone (its retry would go to the other farm)", async () => {
    await phone.engine.syncNow(); // the waiting lot goes up first
    expect(await countLeftBehind(phone.db)).toEqual({ pending: 0, refused: 0, photos: 0, waiting: { records: 0, photos: 0, parts: [] } });
    await phone.db.outbox.add({ id: crypto.randomUUID(), name: "lot.update", args: {}, at: new Date().toISOString(), status: "rejected", error: { code: "forbidden", message: "No." }, tries: 1 });
    const refused = await switchFarm(farmB, opts());
    expect(refused).toMatchObject({ ok: false, reason: "unsent", left: { pending: 0, refused: 1, photos: 0 } });
    await phone.db.outbox.clear();

    await phone.db.pending_photos.add({ id: crypto.randomUUID(), bag_id: crypto.randomUUID(), check_id: null, blob: new Blob(["x"]), mime: "image/jpeg", created_at: new Date().toISOString(), tries: 1, error: "Upload refused (415)." });
    expect(await switchFarm(farmB, opts())).toMatchObject({ ok: false, reason: "unsent", left: { photos: 1 } });
    await phone.db.pending_photos.clear();
    expect((await loadIdentity(phone.db))?.farm.id).toBe(grower.farmId);
  });

  it("refuses a farm the person does not belong to with the server's words, changing nothing", async () => {
    const stranger = await signedInMember(db, { role: "owner", farmName: "Someone Else's Farm" });
    const before = await phone.db.lots.count();
    const result = await switchFarm(stranger.farmId, opts());
    expect(result).toEqual({ ok: false, reason: "server", status: 404, message: "That farm was not found." });
    expect(await phone.db.lots.count()).toBe(before);
    expect(await serverFarmOf()).toBe(grower.farmId);
  });

  it("sends waiting work to the farm it was recorded on, then switches; the phone then holds only the new farm", async () => {
    phone.use();
    const lot = await createLot({ species: "Echinacea pallida", year: 2026 });
    const result = await switchFarm(farmB, opts());
    expect(result).toMatchObject({ ok: true, identity: { farm: { id: farmB, name: "Quill Seed Library" }, role: "helper" } });
    // The change reached the farm it belongs to, and only that one.
    expect((await lotsOn(grower.farmId)).map((l) => l.id)).toContain(lot.id);
    expect((await lotsOn(farmB)).map((l) => l.id)).not.toContain(lot.id);
    // The phone's copy was emptied for the new farm: nothing of the old one is left, nothing waits.
    expect(await phone.db.lots.get(lot.id)).toBeUndefined();
    expect(await phone.db.outbox.count()).toBe(0);
    const identity = await loadIdentity(phone.db);
    expect(identity).toMatchObject({ farm: { id: farmB }, role: "helper" });
    expect((identity as { farms?: unknown[] }).farms).toHaveLength(2);
    expect(await serverFarmOf()).toBe(farmB);

    await phone.engine.syncNow();
    const lots = await phone.db.lots.toArray();
    expect(lots.map((l) => l.species)).toEqual(["Asclepias tuberosa"]);
    expect(lots.every((l) => l.farm_id === farmB)).toBe(true);
  });
});

describe("the words when a switch is refused", () => {
  it.each([
    [{ pending: 1, refused: 0, photos: 0, waiting: { records: 1, photos: 0, parts: [{ name: "lot.create", n: 1 }] } }, /^1 new seed lot is still only on this phone and could not be sent to Bramblewick just now\. .*until it has gone up\./],
    [
      { pending: 2, refused: 0, photos: 1, waiting: { records: 2, photos: 1, parts: [{ name: "check.record", n: 2 }] } },
      /^2 checks and 1 photo are still only on this phone.*until they have gone up\. Find signal, wait for “Synced” at the top, then switch\.$/,
    ],
    [{ pending: 0, refused: 1, photos: 0 }, /^1 change Bramblewick refused is still on this phone\. Tap the sync status at the top and try it again or let it go first/],
    [{ pending: 0, refused: 3, photos: 0 }, /^3 changes Bramblewick refused are still on this phone\. .*try them again or let them go first, so nothing is sent to the wrong farm\.$/],
  ] as [Omit<LeftBehind, "waiting"> & { waiting?: LeftBehind["waiting"] }, RegExp][])("%o", (left, words) => {
    expect(describeLeftBehind("Bramblewick", { waiting: { records: 0, photos: 0, parts: [] }, ...left })).toMatch(words);
  });
});
