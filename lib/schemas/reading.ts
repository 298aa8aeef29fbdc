import { z } from "zod";
import { Id, IsoTimestamp, SyncColumns, serverStamped } from "./common";

/** A cold-store temperature reading. Append-only. Always stored in °C; the unit is converted on entry. */
export const Reading = SyncColumns.extend({
  store_id: Id,
  taken_at: IsoTimestamp,
  temperature_c: z.number({ error: "Enter the temperature." }).min(-60, { error: "Colder than any store; check the reading." }).max(60, { error: "Hotter than any store; check the reading." }),
  origin: z.enum(["manual", "check", "import"]).default("manual"),
  check_id: Id.nullable().default(null),
});
export type Reading = z.infer<typeof Reading>;
export const ReadingInput = Reading.omit(serverStamped);
export type ReadingInput = z.input<typeof ReadingInput>;
