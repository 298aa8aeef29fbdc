import { DomainError } from "@/lib/errors";

// Douglas Crockford, "Base 32" (crockford.com/base32.html): 32 symbols without I, L, O, U; decoding folds
// O→0 and I/L→1 and ignores hyphens; an optional check symbol encodes the value modulo 37 with * ~ $ = U for 32–36.

export const crockfordSymbols = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";
export const crockfordCheckSymbols = `${crockfordSymbols}*~$=U`;
/** Data symbols in a bag code; one check symbol follows. 32^6 ≈ 1.07 billion codes. */
export const bagCodeDataLength = 6;

const decodeTable: Record<string, number> = (() => {
  const t: Record<string, number> = {};
  for (let i = 0; i < crockfordCheckSymbols.length; i++) t[crockfordCheckSymbols[i]] = i;
  Object.assign(t, { O: 0, I: 1, L: 1 });
  return t;
})();

/** Upper-cases, drops hyphens and spaces, folds O→0 and I/L→1. */
export function normalizeCrockford(text: string): string {
  return text
    .toUpperCase()
    .replace(/[\s-]+/g, "")
    .replace(/O/g, "0")
    .replace(/[IL]/g, "1");
}

function valueOf(symbol: string): number {
  const v = decodeTable[symbol];
  if (v === undefined || v >= 32) throw new DomainError(`"${symbol}" is not a bag-code character.`);
  return v;
}

export function encodeCrockford(value: bigint | number): string {
  let n = BigInt(value);
  if (n < 0n) throw new DomainError("Only whole numbers of zero or more can be encoded.");
  if (n === 0n) return "0";
  let out = "";
  while (n > 0n) {
    out = crockfordSymbols[Number(n % 32n)] + out;
    n /= 32n;
  }
  return out;
}

export function decodeCrockford(text: string): bigint {
  const s = normalizeCrockford(text);
  if (s === "") throw new DomainError("There is nothing to decode.");
  let n = 0n;
  for (const ch of s) n = n * 32n + BigInt(valueOf(ch));
  return n;
}

/** The check symbol: the number's value modulo 37, computed digit by digit so any length works. */
export function computeCheckSymbol(data: string): string {
  const s = normalizeCrockford(data);
  let r = 0;
  for (const ch of s) r = (r * 32 + valueOf(ch)) % 37;
  return crockfordCheckSymbols[r];
}

/** A new bag code from caller-supplied random bytes (keeps this pure; use crypto.getRandomValues). */
export function generateBagCode(randomBytes: Uint8Array, dataLength = bagCodeDataLength): string {
  if (randomBytes.length < dataLength) throw new DomainError(`A bag code needs ${dataLength} random bytes.`);
  let data = "";
  // 256 is a multiple of 32, so the low five bits of each byte are uniform.
  for (let i = 0; i < dataLength; i++) data += crockfordSymbols[randomBytes[i] & 31];
  return data + computeCheckSymbol(data);
}

/** "K7M4QZX" → "K7M-4QZX", easier to read aloud and type. */
export function formatBagCode(code: string): string {
  const s = normalizeCrockford(code);
  const cut = Math.floor(s.length / 2);
  return s.length > 4 ? `${s.slice(0, cut)}-${s.slice(cut)}` : s;
}

export type BagCodeParse =
  | { ok: true; code: string }
  | { ok: false; reason: "empty" | "bad_character" | "wrong_length" | "wrong_check"; message: string };

/** Reads a typed or scanned code: any case, hyphens and spaces ignored, O→0, I/L→1; the check symbol must match. */
export function parseBagCode(text: string, dataLength = bagCodeDataLength): BagCodeParse {
  const s = normalizeCrockford(text);
  if (s === "") return { ok: false, reason: "empty", message: "Type the code from the bag's label." };
  const body = s.slice(0, -1);
  const check = s.slice(-1);
  for (const ch of body) {
    const v = decodeTable[ch];
    if (v === undefined || v >= 32) {
      return { ok: false, reason: "bad_character", message: `"${ch}" does not appear in bag codes; check the label again.` };
    }
  }
  if (decodeTable[check] === undefined) {
    return { ok: false, reason: "bad_character", message: `"${check}" does not appear in bag codes; check the label again.` };
  }
  if (s.length !== dataLength + 1) {
    return { ok: false, reason: "wrong_length", message: `A bag code has ${dataLength + 1} characters; this one has ${s.length}.` };
  }
  if (computeCheckSymbol(body) !== check) {
    return { ok: false, reason: "wrong_check", message: "That code does not add up: one character is probably mistyped." };
  }
  return { ok: true, code: s };
}

function isOneSubstitutionOrSwap(a: string, b: string): boolean {
  if (a.length !== b.length || a === b) return false;
  const diffs: number[] = [];
  for (let i = 0; i < a.length; i++) {
    if (a[i] !== b[i]) {
      diffs.push(i);
      if (diffs.length > 2) return false;
    }
  }
  if (diffs.length === 1) return true;
  const [i, j] = diffs;
  return j === i + 1 && a[i] === b[j] && a[j] === b[i];
}

/** Known codes one mistyped character or one swapped neighbour pair away from what was typed. */
export function suggestBagCodes(text: string, knownCodes: readonly string[], limit = 5): string[] {
  const typed = normalizeCrockford(text);
  const out: string[] = [];
  for (const known of knownCodes) {
    const k = normalizeCrockford(known);
    if (isOneSubstitutionOrSwap(typed, k)) out.push(k);
    if (out.length >= limit) break;
  }
  return out;
}
