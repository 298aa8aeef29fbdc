import { normalizeCrockford, parseBagCode } from "./bag-codes";

// What a Rimebook label's QR code says: a link to the bag's check sheet, `${origin}/check?code=K7M44QZX`.
// Any phone camera app then opens the right sheet; inside Rimebook the scanner reads the code from it.
// The reader also takes `rimebook:bag:K7M44QZX` and a bare code, so labels printed by hand or by an older
// address still scan. The origin is not trusted: the code is looked up in the signed-in farm's own bags.

export const labelPath = "/check";
export const labelScheme = "rimebook:bag:";

/** The QR text printed on a bag's label. */
export function buildLabelPayload(code: string, origin: string): string {
  const base = origin.replace(/\/+$/, "");
  return `${base}${labelPath}?${new URLSearchParams({ code: normalizeCrockford(code) }).toString()}`;
}

export type LabelRead =
  | { ok: true; code: string }
  | { ok: false; reason: "not_rimebook" | "bad_code"; message: string };

const notRimebook: LabelRead = {
  ok: false,
  reason: "not_rimebook",
  message: "That QR code is not a Rimebook bag label.",
};

function readCode(candidate: string): LabelRead {
  const parsed = parseBagCode(candidate);
  if (parsed.ok) return { ok: true, code: parsed.code };
  return { ok: false, reason: "bad_code", message: `The label's code cannot be read: ${parsed.message}` };
}

/** Reads what the camera saw. Returns the normalized bag code, or why it is not one. */
export function readLabelPayload(text: string): LabelRead {
  const t = text.trim();
  if (t === "") return notRimebook;
  if (t.toLowerCase().startsWith(labelScheme)) return readCode(t.slice(labelScheme.length));
  if (/^https?:\/\//i.test(t)) {
    let url: URL;
    try {
      url = new URL(t);
    } catch {
      return notRimebook;
    }
    const code = url.searchParams.get("code");
    if (!url.pathname.replace(/\/+$/, "").endsWith(labelPath) || code === null) return notRimebook;
    return readCode(code);
  }
  // A bare code: only when it parses, check character included, so stray text is not mistaken for a bag.
  const bare = parseBagCode(t);
  return bare.ok ? { ok: true, code: bare.code } : notRimebook;
}
