import fs from "node:fs";
import { NextResponse } from "next/server";
import { AppError } from "@/lib/errors";
import { requireMember } from "@/lib/server/auth";
import { route } from "@/lib/server/http";

export const dynamic = "force-dynamic";

// The benchmark's framework floor (tests/bench/run.ts): the same JSON as a pull, answered by a route handler of
// the same build with no database; `?session=1` adds the session check only. It exists only when the server is
// started with RIMEBOOK_BENCH_FLOOR_FILE (the JSON to answer); otherwise it is not found, as any unknown address.
let cached: { file: string; body: unknown } | null = null;

function floorBody(): unknown {
  const file = process.env.RIMEBOOK_BENCH_FLOOR_FILE;
  if (!file) throw new AppError("not_found", "There is nothing at this address.");
  if (cached?.file !== file) cached = { file, body: JSON.parse(fs.readFileSync(file, "utf8")) };
  return cached.body;
}

export const GET = route(async (req) => {
  const body = floorBody();
  if (new URL(req.url).searchParams.get("session")) await requireMember(req);
  return NextResponse.json(body, { headers: { "cache-control": "no-store" } });
});
