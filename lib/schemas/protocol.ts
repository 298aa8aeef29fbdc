import { z } from "zod";
import { timedPhaseKinds } from "./words";
import { PhaseKind } from "./vocabulary";

// A species' pretreatment: ordered phases, each backed by one or more sources. Storage adds ids and farm columns
// with .extend(); forms and the outbox use this shape as is.

const wholeDays = z
  .number({ error: "Enter a number of days." })
  .int({ error: "Days must be a whole number." })
  .min(0, { error: "Days cannot be negative." })
  .max(3650, { error: "That is more than ten years; check the number of days." });

const degreesC = z
  .number({ error: "Enter a temperature in °C." })
  .min(-50, { error: "That is colder than any store; check the temperature." })
  .max(60, { error: "That is hotter than any pretreatment; check the temperature." });

export const TemperatureBand = z
  .object({ minC: degreesC, maxC: degreesC })
  .refine((b) => b.minC <= b.maxC, { error: "The lowest temperature must not be above the highest.", path: ["maxC"] });
export type TemperatureBand = z.infer<typeof TemperatureBand>;

export const ProtocolSource = z
  .object({
    citation: z.string().trim().min(1, { error: "Say where these numbers come from (a book, paper, supplier or your own records)." }).max(500),
    minDays: wholeDays,
    /** Null when the source gives no upper limit ("4 weeks or more"). */
    maxDays: wholeDays.nullable(),
    band: TemperatureBand.nullable().default(null),
    note: z.string().trim().max(500).default(""),
  })
  .refine((s) => s.maxDays === null || s.minDays <= s.maxDays, { error: "The shortest time must not be longer than the longest.", path: ["maxDays"] });
export type ProtocolSource = z.infer<typeof ProtocolSource>;

export { timedPhaseKinds } from "./words";

export const ProtocolPhase = z
  .object({
    kind: PhaseKind,
    sources: z.array(ProtocolSource).default([]),
    note: z.string().trim().max(500).default(""),
  })
  .refine((p) => !(timedPhaseKinds as readonly string[]).includes(p.kind) || p.sources.length > 0, {
    error: "A warm, cold or frozen phase needs at least one source with its days.",
    path: ["sources"],
  });
export type ProtocolPhase = z.infer<typeof ProtocolPhase>;

export const ToxicSeedFlag = z.object({
  citation: z.string().trim().max(500),
  // Flags recalled from memory stay unverified until a grower or the team adds a source.
  verified: z.boolean(),
  note: z.string().trim().max(500).default(""),
});
export type ToxicSeedFlag = z.infer<typeof ToxicSeedFlag>;

export const Protocol = z.object({
  species: z.string().trim().min(1, { error: "Name the species." }).max(200),
  commonName: z.string().trim().max(200).default(""),
  phases: z.array(ProtocolPhase).max(12),
  /** The temperatures that count as cold for this species; null means the default 0–10 °C. */
  effectiveBand: TemperatureBand.nullable().default(null),
  /** Written by the farm (its own numbers), as opposed to a starter row copied with published sources. */
  isFarmOwn: z.boolean().default(true),
  /** Set when the species needs no cold at all, with the reason shown to the grower. */
  noColdReason: z.string().trim().max(500).default(""),
  toxicSeed: ToxicSeedFlag.nullable().default(null),
  medicinal: z.boolean().default(false),
  note: z.string().trim().max(1000).default(""),
});
export type Protocol = z.infer<typeof Protocol>;
/** What a form or import sends before defaults are filled in. */
export type ProtocolInput = z.input<typeof Protocol>;
