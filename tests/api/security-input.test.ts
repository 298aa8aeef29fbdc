import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { uuid } from "../support/sync";
import { env } from "@/lib/server/env";
import { photoLimits } from "@/lib/schemas/photo";
import { POST as signUp } from "@/app/api/auth/sign-up/route";
import { PATCH as patchMe } from "@/app/api/me/route";
import { POST as push } from "@/app/api/sync/push/route";
import { POST as upload } from "@/app/api/uploads/route";

// Issue 11, item 7: a lone UTF-16 surrogate (half an emoji, which no UTF-8 text can hold) is refused with a
// 400 field error instead of being stored as broken text; an upload with no content-length stops being read
// at the cap (413) instead of being read whole. (Strict-Transport-Security: tests/unit/front-door.test.ts.)

const origin = new URL(env.APP_ORIGIN).origin;
const noCtx = {} as never;
let ctx: Awaited<ReturnType<typeof freshDatabase>>;
let owner: TestMember;
beforeAll(async () => {
  ctx = await freshDatabase();
  owner = await signedInMember(ctx.db, { role: "owner" });
});
afterAll(async () => ctx.cleanup());

/** JSON text with a real lone surrogate escape in it (JSON.stringify would keep it escaped too). */
const rawJson = (text: string) => ({ method: "POST", headers: { "content-type": "application/json", origin }, body: text });

describe("lone surrogates", () => {
  it.each(["\\ud800", "\\udfff", "Wren \\ud83c", "\\udc00 Alder"])("sign-up with the name %s → 400 on the name field, no account", async (name) => {
    const email = `surrogate-${uuid().slice(0, 6)}@example.test`;
    const res = await signUp(new Request(`${origin}/api/auth/sign-up`, rawJson(`{"email":"${email}","password":"frost on the barn door","name":"${name}","farmName":"Farm"}`)), noCtx);
    expect(res.status).toBe(400);
    const { error } = await res.json();
    expect(error.code).toBe("invalid");
    expect(Object.keys(error.fields)).toEqual(["name"]);
    expect(await ctx.db("users").where({ email }).first()).toBeUndefined();
  });

  it("a whole emoji (a surrogate pair) is fine", async () => {
    const res = await patchMe(memberRequest("/api/me", owner, { method: "PATCH", json: { name: "Wren 🌱" } }), noCtx);
    expect(res.status).toBe(200);
  });

  it("in a pushed mutation, only that mutation is refused, with the field named", async () => {
    const good = { id: uuid(), name: "store.create", args: { id: uuid(), name: "Barn fridge", kind: "fridge" }, at: "2026-11-20T08:00:00.000Z" };
    const bad = { id: uuid(), name: "store.create", args: { id: uuid(), name: "@@NAME@@", kind: "fridge" }, at: "2026-11-20T08:00:00.000Z" };
    const body = JSON.stringify({ deviceId: "device-u", mutations: [good, bad] }).replace("@@NAME@@", "Shed \\ud800 fridge");
    const res = await push(new Request(`${origin}/api/sync/push`, { method: "POST", headers: { ...owner.headers, "content-type": "application/json" }, body }), noCtx);
    expect(res.status).toBe(200);
    const result = await res.json();
    expect(result.applied).toEqual([good.id]);
    expect(result.rejected).toEqual([{ id: bad.id, error: expect.objectContaining({ code: "invalid", fields: { name: expect.any(String) } }) }]);
    expect(await ctx.db("stores").where({ id: bad.args.id }).first()).toBeUndefined();
  });
});

describe("an upload without content-length", () => {
  it("is refused with 413 once the cap is passed, without reading the rest of a 50 MB body", async () => {
    const total = 50 * 1024 * 1024;
    const chunk = new Uint8Array(64 * 1024).fill(0x41);
    let pulled = 0;
    const boundary = "----rimebook-test";
    const head = new TextEncoder().encode(`--${boundary}\r\nContent-Disposition: form-data; name="bagId"\r\n\r\n${uuid()}\r\n--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="big.jpg"\r\nContent-Type: image/jpeg\r\n\r\n`);
    let sentHead = false;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (!sentHead) {
          sentHead = true;
          controller.enqueue(head);
          return;
        }
        if (pulled >= total) return controller.close();
        pulled += chunk.byteLength;
        controller.enqueue(chunk);
      },
    });
    const req = new Request(`${origin}/api/uploads`, {
      method: "POST",
      headers: { ...owner.headers, "content-type": `multipart/form-data; boundary=${boundary}` },
      body,
      duplex: "half",
    } as RequestInit);
    expect(req.headers.get("content-length")).toBeNull();
    const res = await upload(req, noCtx);
    expect(res.status).toBe(413);
    expect((await res.json()).error.code).toBe("too_large");
    expect(pulled).toBeLessThan(photoLimits.maxBytes * 2);
  });
});
