import { NextResponse } from "next/server";
import { requireMember, withSessionCookie } from "@/lib/server/auth";
import { getDb } from "@/lib/server/db";
import { route } from "@/lib/server/http";
import { findFarmTimeZone, findStore, importReadingsCsv, readCsvUpload, readImportOptions } from "@/lib/server/imports";

export const dynamic = "force-dynamic";

type Ctx = { params: Promise<{ id: string }> };

/**
 * A logger's CSV (timestamp, temperature) for one cold store: text/csv body or a form upload ("file").
 * ?dryRun=1 previews; ?unit=C|F and ?dateOrder=dmy|mdy|auto when the file does not say.
 * All or nothing: 422 with a report for every bad row; readings already recorded are skipped and counted.
 */
export const POST = route<Ctx>(async (req, ctx) => {
  const member = await requireMember(req, "import.readings");
  const { id } = await ctx.params;
  const db = getDb();
  await findStore(db, member.farmId, id); // another farm's store is missing (404) before any upload is read
  const upload = await readCsvUpload(req);
  const options = readImportOptions(req, upload);
  const answer = await importReadingsCsv(db, {
    farmId: member.farmId,
    storeId: id,
    text: upload.text,
    options,
    timeZone: await findFarmTimeZone(db, member.farmId),
  });
  return withSessionCookie(NextResponse.json({ ...answer.body, fileName: upload.fileName }, { status: answer.status }), member);
});
