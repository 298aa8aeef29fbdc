import QRCode from "qrcode";
import type { BagRow } from "@/lib/domain/rows/bag-rows";
import { formatLongDay, formatShortDay } from "@/components/bags/format-day";
import { pickBagCautions } from "@/components/check/bag-cautions";
import { formatPullWindow } from "@/components/check/sheet-view";
import type { FarmRows } from "@/lib/client/fridge-reads";
import { buildLabelPayload } from "@/lib/domain/label-payload";
import type { BagState } from "@/lib/schemas/words";

// What each printed label says, and its QR code drawn as one SVG path (crisp at any print size).

export const labelSizes = {
  small: { name: '2 × 1 in roll (one label per page)', widthMm: 50.8, heightMm: 25.4 },
  large: { name: '4 × 2 in roll (one label per page)', widthMm: 101.6, heightMm: 50.8 },
  a4: { name: "A4 sheet, 21 labels of 63.5 × 38.1 mm", widthMm: 63.5, heightMm: 38.1 },
} as const;
export type LabelSize = keyof typeof labelSizes;

/** A4 sheets of 3 × 7 labels: the usual layout (sheet margins from memory of common stock; check your sheets). */
export const a4Grid = { columns: 3, rows: 7, topMm: 15.15, leftMm: 7.25, columnGapMm: 2.5 } as const;

export interface LabelData {
  id: string;
  code: string;
  codeShown: string;
  payload: string;
  species: string;
  commonName: string;
  lotText: string;
  startText: string;
  windowText: string;
  whereText: string;
  toxic: boolean;
  treated: boolean;
}

/** Bags that still need a label on the fridge shelf. */
export const labelledStates: readonly BagState[] = ["planned", "chilling", "window_open", "overdue"];

export function buildLabels(rows: readonly BagRow[], farm: Pick<FarmRows, "lots" | "protocols" | "bags">, origin: string): LabelData[] {
  const lotById = new Map(farm.lots.map((l) => [l.id, l]));
  const protocolById = new Map(farm.protocols.map((p) => [p.id, p]));
  const bagById = new Map(farm.bags.map((b) => [b.id, b]));
  return rows.map((row) => {
    const lot = lotById.get(row.lotId);
    const bag = bagById.get(row.id);
    const protocolId = bag?.protocol_id ?? lot?.protocol_id ?? null;
    const protocol = protocolId ? protocolById.get(protocolId) : undefined;
    const cautions = pickBagCautions({ species: row.species, toxicSeed: protocol?.toxic_seed ?? null, treated: Boolean(lot?.treated) });
    const w = row.window;
    return {
      id: row.id,
      code: row.code,
      codeShown: row.codeShown,
      payload: buildLabelPayload(row.code, origin),
      species: row.species,
      commonName: row.commonName,
      lotText: [lot?.source, lot?.year].filter((v) => v !== null && v !== undefined && v !== "").join(" ") || "",
      startText: row.startedOn ? `Started ${formatLongDay(row.startedOn)}` : row.plannedStartOn ? `Starts ${formatLongDay(row.plannedStartOn)}` : "Start not set",
      windowText: w ? `Pull ${formatPullWindow(w, formatShortDay).replace(/^From/, "from")}` : row.startedOn ? "Pull when roots show" : "Pull window counted from the start",
      whereText: [row.storeName, row.box].filter(Boolean).join(" · "),
      toxic: cautions.some((c) => c.key === "toxic"),
      treated: cautions.some((c) => c.key === "treated"),
    };
  });
}

export interface QrDrawing {
  /** Modules per side including the quiet zone. */
  size: number;
  /** One path of unit squares for the dark modules. */
  path: string;
}

/** QR modules (ISO/IEC 18004, error correction M) as an SVG path, with the standard four-module quiet zone. */
export function drawQr(text: string, quietZone = 4): QrDrawing {
  const { modules } = QRCode.create(text, { errorCorrectionLevel: "M" });
  const n = modules.size;
  let path = "";
  for (let y = 0; y < n; y++) {
    let x = 0;
    while (x < n) {
      if (!modules.get(y, x)) {
        x++;
        continue;
      }
      const start = x;
      while (x < n && modules.get(y, x)) x++;
      path += `M${start + quietZone} ${y + quietZone}h${x - start}v1h${start - x}z`;
    }
  }
  return { size: n + 2 * quietZone, path };
}

/** Splits labels into printed pages (A4: 21 per sheet; rolls: one per page). */
export function pageLabels<T>(labels: readonly T[], size: LabelSize): T[][] {
  const per = size === "a4" ? a4Grid.columns * a4Grid.rows : 1;
  const pages: T[][] = [];
  for (let i = 0; i < labels.length; i += per) pages.push(labels.slice(i, i + per));
  return pages;
}
