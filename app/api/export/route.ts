import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { readQuery, route } from "@/lib/server/http";
import { ExportQuery, attachment, exportCsv } from "@/lib/server/exports";

export const dynamic = "force-dynamic";

/** ?what=bags|checks|counts|readings|sowings&format=csv → a CSV download of the member's own farm. */
export const GET = route(async (req) => {
  const member = await requireMember(req, "export.read");
  const { what } = readQuery(req, ExportQuery);
  const file = await exportCsv(getDb(), member.farmId, what);
  const res = new Response(file.csv, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": attachment(file.fileName),
      "cache-control": "no-store",
      "x-rimebook-rows": String(file.rows),
    },
  });
  return withSessionCookie(res, member);
});
