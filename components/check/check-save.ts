import type { IsoDay } from "@/lib/domain/dates";
import { parseTemperature, type TemperatureUnit } from "@/lib/domain/units";
import { DomainError } from "@/lib/errors";
import { mutationTable, type MutationArgs } from "@/lib/schemas/mutations";
import { Reading } from "@/lib/schemas/reading";
import { spreadingMouldReason, type BagForCheck, type CheckDraft, type CheckEnd } from "./check-draft";

// The mutations a check sheet's save makes, validated by the shared schemas. Kept apart from ./check-draft
// so the sheet loads zod and the schema table only when a save is tapped (see CheckSheet's loadSave).

export interface CheckSaveContext {
  bag: Pick<BagForCheck, "id" | "storeId">;
  now: Date;
  today: IsoDay;
  unit: TemperatureUnit;
  newId: () => string;
}

export interface CheckSavePlan {
  check: MutationArgs<"check.record">;
  reading: MutationArgs<"reading.record"> | null;
  pull: MutationArgs<"bag.pull"> | null;
  discard: MutationArgs<"bag.discard"> | null;
}

export type CheckSaveResult = { ok: true; plan: CheckSavePlan } | { ok: false; fields: Partial<Record<"temperature" | "note" | "form", string>> };

/** Validates the draft with the shared mutation schemas and lays out what to save; `end` pulls or discards too. */
export function planCheckSave(draft: CheckDraft, ctx: CheckSaveContext, end?: CheckEnd): CheckSaveResult {
  let temperatureC: number | null = null;
  if (draft.temperatureText.trim() !== "") {
    try {
      temperatureC = Math.round(parseTemperature(draft.temperatureText, ctx.unit).celsius * 10) / 10;
    } catch (e) {
      return { ok: false, fields: { temperature: e instanceof DomainError ? e.message : "That is not a temperature." } };
    }
    // The reading schema holds the grower-worded range check ("Hotter than any store…").
    const inRange = Reading.shape.temperature_c.safeParse(temperatureC);
    if (!inRange.success) return { ok: false, fields: { temperature: inRange.error.issues[0]?.message ?? "Check the temperature." } };
  }
  const at = ctx.now.toISOString();
  const checkId = ctx.newId();
  // The check's record says what ended the bag, as it did when these were ticked among the actions.
  const endAction = end?.kind === "pull" ? "pulled" : end?.kind === "discard" ? "discarded" : null;
  const actions = endAction && !draft.actions.includes(endAction) ? [...draft.actions, endAction] : draft.actions;
  const check = mutationTable["check.record"].args.safeParse({
    id: checkId,
    bag_id: ctx.bag.id,
    checked_at: at,
    moisture: draft.moisture,
    mould: draft.mould,
    sprouts: draft.sprouts,
    actions,
    note: draft.note.trim() === "" ? null : draft.note,
    temperature_c: temperatureC,
  });
  if (!check.success) {
    const fields: Partial<Record<"temperature" | "note" | "form", string>> = {};
    for (const issue of check.error.issues) {
      const key = issue.path[0] === "note" ? "note" : issue.path[0] === "temperature_c" ? "temperature" : "form";
      fields[key] ??= issue.message;
    }
    return { ok: false, fields };
  }
  let reading: MutationArgs<"reading.record"> | null = null;
  if (temperatureC !== null && ctx.bag.storeId) {
    const parsed = mutationTable["reading.record"].args.safeParse({
      id: ctx.newId(),
      store_id: ctx.bag.storeId,
      taken_at: at,
      temperature_c: temperatureC,
      origin: "check",
      check_id: checkId,
    });
    if (!parsed.success) return { ok: false, fields: { temperature: parsed.error.issues[0]?.message ?? "Check the temperature." } };
    reading = parsed.data;
  }
  const discarded = actions.includes("discarded");
  const pulled = !discarded && actions.includes("pulled");
  const endOn = end?.on ?? ctx.today;
  const discardReason = end?.kind === "discard" && end.reason ? end.reason : draft.mould === "spreading" ? spreadingMouldReason : null;
  return {
    ok: true,
    plan: {
      check: check.data,
      reading,
      pull: pulled ? { id: ctx.bag.id, pulled_on: endOn } : null,
      discard: discarded ? { id: ctx.bag.id, discarded_on: endOn, discard_reason: discardReason } : null,
    },
  };
}
