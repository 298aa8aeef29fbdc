import { z } from "zod";
import { PlanItemInput, type PlanItem } from "@/lib/schemas/plan";

// The shared plan schema, with the sowing rule laid flat and shares typed as percentages (as growers say them),
// and the conversions between it and the stored plan row.
const percent = z
  .number({ error: "Enter a percentage, e.g. 60." })
  .gt(0, { error: "Enter a percentage above 0." })
  .max(100, { error: "A percentage is at most 100." })
  .nullable();
export const PlanForm = PlanItemInput.pick({ species: true, lot_id: true, protocol_id: true, target_plants: true, note: true })
  .extend({
    anchor: z.enum(["frost", "date"]),
    weeks: z.number({ error: "Enter a number of weeks, e.g. −6." }).int({ error: "Use whole weeks." }).min(-26).max(26),
    date: z.string(),
    place: z.enum(["indoor", "outdoor"]),
    germinationPct: percent,
    survivalPct: percent,
  })
  .refine((f) => f.anchor !== "date" || /^\d{4}-\d{2}-\d{2}$/.test(f.date), { error: "Pick the sowing date.", path: ["date"] });
export type PlanFormValues = z.input<typeof PlanForm>;

export function planItemToForm(item?: Pick<PlanItem, "species" | "lot_id" | "protocol_id" | "target_plants" | "note" | "sowing_rule" | "expected_germination" | "expected_survival">): PlanFormValues {
  const rule = item?.sowing_rule ?? { anchor: "frost" as const, weeks: -6, place: "indoor" as const };
  const pct = (x: number | null | undefined) => (x == null ? null : Math.round(x * 1000) / 10);
  return {
    species: item?.species ?? "",
    lot_id: item?.lot_id ?? null,
    protocol_id: item?.protocol_id ?? null,
    target_plants: item?.target_plants ?? 50,
    note: item?.note ?? null,
    anchor: rule.anchor,
    weeks: rule.anchor === "frost" ? rule.weeks : -6,
    date: rule.anchor === "date" ? rule.date : "",
    place: rule.place,
    germinationPct: pct(item?.expected_germination),
    survivalPct: pct(item?.expected_survival),
  };
}

export function planFormToItem(
  f: z.output<typeof PlanForm>,
  keep: { id?: string; season: number; bag_id: string | null },
): Omit<PlanItemInput, "id"> & { id?: string } {
  return {
    id: keep.id,
    season: keep.season,
    bag_id: keep.bag_id,
    species: f.species,
    lot_id: f.lot_id ?? null,
    protocol_id: f.protocol_id ?? null,
    target_plants: f.target_plants,
    note: f.note ?? null,
    sowing_rule: f.anchor === "frost" ? { anchor: "frost", weeks: f.weeks, place: f.place } : { anchor: "date", date: f.date, place: f.place },
    expected_germination: f.germinationPct == null ? null : f.germinationPct / 100,
    expected_survival: f.survivalPct == null ? null : f.survivalPct / 100,
  };
}
