import { DomainError } from "@/lib/errors";

// Douglas Crockford, "Base 32" (crockford.com/base32.html): 32 symbols without I, L, O, U; decoding folds
// O→0 and I/L→1 and ignores hyphens; an optional check symbol encodes the value modulo 37 with * ~ $ = U for 32–36.
//
// Bag codes. New codes: 7 data symbols and a check character from the same 32 symbols, computed with Damm's
// totally anti-symmetric quasigroup x∘y = a·x ⊕ y over GF(2⁵) (Damm 2004): it catches every single wrong character
// and every swap of neighbours, and never needs the phone's symbol keyboard. Codes printed before (6 data symbols
// and Crockford's mod-37 check, which may be * ~ $ = U) keep scanning and typing: the length tells the two apart,
// and a typo never changes the length, so each kind keeps its own guarantee.

export const crockfordSymbols = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";
export const crockfordCheckSymbols = `${crockfordSymbols}*~$=U`;
/** Data symbols in a new bag code; one check character follows. 32^7 ≈ 34 billion codes. */
export const bagCodeDataLength = 7;
/** Data symbols in a code printed before the Damm check (mod-37 check symbol). */
export const legacyBagCodeDataLength = 6;

const decodeTable: Record<string, number> = (() => {
  const t: Record<string, number> = {};
  for (let i = 0; i < crockfordCheckSymbols.length; i++) t[crockfordCheckSymbols[i]] = i;
  Object.assign(t, { O: 0, I: 1, L: 1 });
  return t;
})();

/** JavaScript's \s: the characters a typed or pasted code may carry between its symbols. */
function isSpace(c: number): boolean {
  return (
    c === 32 || (c >= 9 && c <= 13) || c === 0xa0 || c === 0x1680 || (c >= 0x2000 && c <= 0x200a) ||
    c === 0x2028 || c === 0x2029 || c === 0x202f || c === 0x205f || c === 0x3000 || c === 0xfeff
  );
}

/** Upper-cases, drops hyphens and spaces, folds O→0 and I/L→1. One pass after the upper-casing, and a stored code
 *  (already clean) comes back as it is: every bag row and label normalises its code. */
export function normalizeCrockford(text: string): string {
  const s = text.toUpperCase();
  let i = 0;
  for (; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c === 79 /* O */ || c === 73 /* I */ || c === 76 /* L */ || c === 45 /* - */ || isSpace(c)) break;
  }
  if (i === s.length) return s;
  // Runs between the characters dropped or folded are copied whole ("BN00001-X": two pieces, not nine).
  let out = "";
  let from = 0;
  for (; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c === 45 || isSpace(c)) {
      out += s.slice(from, i);
      from = i + 1;
    } else if (c === 79 || c === 73 || c === 76) {
      out += s.slice(from, i) + (c === 79 ? "0" : "1");
      from = i + 1;
    }
  }
  return out + s.slice(from);
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

/** a·x in GF(2⁵) with modulus x⁵ + x² + 1 and a = x: shift left, reduce by 0b100101 on overflow. */
function timesA(v: number): number {
  const s = v << 1;
  return s & 32 ? s ^ 0b100101 : s;
}

/** Damm's interim value after the given symbols: interim ← interim ∘ d = a·interim ⊕ d, from 0. */
function dammInterim(symbols: string): number {
  let interim = 0;
  for (const ch of symbols) interim = timesA(interim) ^ valueOf(ch);
  return interim;
}

/** The check character of a new bag code: the c with interim ∘ c = 0, i.e. c = a·interim. */
export function computeDammCheck(data: string): string {
  return crockfordSymbols[timesA(dammInterim(normalizeCrockford(data)))];
}

/** True when a whole code (data then check) reduces to 0 through the quasigroup. */
function passesDamm(code: string): boolean {
  for (const ch of code) if (decodeTable[ch] === undefined || decodeTable[ch] >= 32) return false;
  return dammInterim(code) === 0;
}

/** A new bag code from caller-supplied random bytes (keeps this pure; use crypto.getRandomValues). */
export function generateBagCode(randomBytes: Uint8Array): string {
  if (randomBytes.length < bagCodeDataLength) throw new DomainError(`A bag code needs ${bagCodeDataLength} random bytes.`);
  let data = "";
  // 256 is a multiple of 32, so the low five bits of each byte are uniform.
  for (let i = 0; i < bagCodeDataLength; i++) data += crockfordSymbols[randomBytes[i] & 31];
  return data + computeDammCheck(data);
}

/** "K7M44QZX" → "K7M4-4QZX" (and "K7M4QZX" → "K7M-4QZX"), easier to read aloud and type. */
export function formatBagCode(code: string): string {
  const s = normalizeCrockford(code);
  const cut = Math.floor(s.length / 2);
  return s.length > 4 ? `${s.slice(0, cut)}-${s.slice(cut)}` : s;
}

export type BagCodeParse =
  | { ok: true; code: string }
  | { ok: false; reason: "empty" | "bad_character" | "wrong_length" | "wrong_check"; message: string };

/** Reads a typed or scanned code: any case, hyphens and spaces ignored, O→0, I/L→1; the check character must match. */
export function parseBagCode(text: string): BagCodeParse {
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
  if (s.length === bagCodeDataLength + 1) {
    if (passesDamm(s)) return { ok: true, code: s };
    return { ok: false, reason: "wrong_check", message: "That code does not add up: one character is probably mistyped." };
  }
  if (s.length !== legacyBagCodeDataLength + 1) {
    return {
      ok: false,
      reason: "wrong_length",
      message: `A bag code has ${bagCodeDataLength + 1} characters (${legacyBagCodeDataLength + 1} on older labels); this one has ${s.length}.`,
    };
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
