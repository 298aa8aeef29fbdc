import { NextResponse } from "next/server";
import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";
import { importLotsCsv, readCsvUpload, readImportOptions } from "@/lib/server/imports";

export const dynamic = "force-dynamic";

/**
 * A seed-lot list as CSV (Species, Common name, Source, Year, Quantity, Treated, Notes): text/csv body
 * or a form upload ("file"). ?dryRun=1 previews. All or nothing, with a report for every row;
 * lots already on the farm (same species, source, year and quantity) are skipped and counted.
 */
export const POST = route(async (req) => {
  const member = await requireMember(req, "import.lots");
  const upload = await readCsvUpload(req);
  const options = readImportOptions(req, upload);
  const answer = await importLotsCsv(getDb(), { farmId: member.farmId, text: upload.text, options });
  return withSessionCookie(NextResponse.json({ ...answer.body, fileName: upload.fileName }, { status: answer.status }), member);
});
