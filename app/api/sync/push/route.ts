import { NextResponse } from "next/server";
import { PushRequest } from "@/lib/schemas/mutations";
import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readJson, route } from "@/lib/server/http";
import { applyPush } from "@/lib/server/sync/apply";

export const dynamic = "force-dynamic";

/** The phone's outbox, in batches: each mutation applied (or refused with a reason) on its own. */
export const POST = route(async (req) => {
  const member = await requireMember(req); // same origin + session; roles are checked per mutation
  const push = await readJson(req, PushRequest, { wellFormed: false }); // broken text refuses its own mutation only
  const result = await applyPush(getDb(), member, push);
  return withSessionCookie(NextResponse.json(result, { headers: { "cache-control": "no-store" } }), member);
});
