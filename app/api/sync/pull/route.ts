import { NextResponse } from "next/server";
import { PullQuery } from "@/lib/schemas/mutations";
import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readQuery, route } from "@/lib/server/http";
import { pullChanges } from "@/lib/server/sync/pull";

export const dynamic = "force-dynamic";

/** Changed rows of the member's farm after `since`, in seq order, tombstones included. */
export const GET = route(async (req) => {
  const member = await requireMember(req);
  const { since, limit } = readQuery(req, PullQuery);
  const page = await pullChanges(getDb(), member.farmId, since, limit);
  return withSessionCookie(NextResponse.json({ ...page, role: member.role }, { headers: { "cache-control": "no-store" } }), member);
});
