import { NextResponse } from "next/server";
import { assertSameOrigin, clearSessionCookie, readSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";
import { readSession, revokeSession } from "@/lib/server/sessions";

export const dynamic = "force-dynamic";

/** Ends this session (the row is revoked, so a copied cookie stops working too). */
export const POST = route(async (req) => {
  assertSameOrigin(req);
  const active = await readSession(readSessionCookie(req));
  if (active) await revokeSession(getDb(), active.session.id);
  return clearSessionCookie(NextResponse.json({ ok: true }));
});
