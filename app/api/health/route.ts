import { NextResponse } from "next/server";
import { getDb } from "@/lib/server/db";
import { checkHealth } from "@/lib/server/health";
import { route } from "@/lib/server/http";

export const dynamic = "force-dynamic";

export const GET = route(async () => {
  const health = await checkHealth(getDb());
  return NextResponse.json({ ...health, app: "rimebook", at: new Date().toISOString() }, { status: health.ok ? 200 : 503 });
});
