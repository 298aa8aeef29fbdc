import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  bagCodeDataLength,
  computeCheckSymbol,
  crockfordCheckSymbols,
  crockfordSymbols,
  decodeCrockford,
  encodeCrockford,
  formatBagCode,
  generateBagCode,
  normalizeCrockford,
  parseBagCode,
  suggestBagCodes,
} from "@/lib/domain";

// Douglas Crockford, "Base 32", crockford.com/base32.html (2002, rev. 2019).
describe("Crockford's Base32 spec", () => {
  it("encodes values 0–31 with 0–9 A–Z minus I, L, O, U (spec symbol table)", () => {
    expect(crockfordSymbols).toBe("0123456789ABCDEFGHJKMNPQRSTVWXYZ");
    expect(crockfordSymbols).not.toMatch(/[ILOU]/);
  });

  it("uses * ~ $ = U for check values 32–36 (spec check-symbol table)", () => {
    expect(crockfordCheckSymbols.slice(32)).toBe("*~$=U");
  });

  it.each([
    ["o", 0n], // spec: o and O decode as 0
    ["O", 0n],
    ["i", 1n], // spec: i, I, l, L decode as 1
    ["L", 1n],
    ["z", 31n], // spec: lower case accepted
    ["10", 32n],
    ["1-0", 32n], // spec: hyphens are ignored when decoding
  ])("decodes %j as %d", (text, value) => {
    expect(decodeCrockford(text)).toBe(value);
  });

  it("check symbol = value mod 37 (spec), on generated values cross-checked with BigInt arithmetic", () => {
    fc.assert(
      fc.property(fc.bigInt({ min: 0n, max: (1n << 100n) - 1n }), (n) => {
        const text = encodeCrockford(n);
        expect(decodeCrockford(text)).toBe(n);
        expect(computeCheckSymbol(text)).toBe(crockfordCheckSymbols[Number(n % 37n)]);
      }),
    );
  });

  // Secondary source: J. D. Cook, "Check sums and error detection" (johndcook.com, 2018), using the Python base32_crockford package.
  it.each([
    ["H88CMK9BVJ1V", "P"],
    ["H88CMK9BVJ1W", "Q"], // wrong last character changes the check
    ["H88CMK9BVJV1", "E"], // transposed last two characters change the check
    ["H88CMK9BVJ10", "*"], // remainder 32 is written *
  ])("check symbol of %s is %s (Cook 2018)", (data, check) => {
    expect(computeCheckSymbol(data)).toBe(check);
  });
});

describe("bag codes", () => {
  const bytes = fc.uint8Array({ minLength: bagCodeDataLength, maxLength: bagCodeDataLength });

  it("a generated code parses back to itself, in any case, with hyphens or spaces (property)", () => {
    fc.assert(
      fc.property(bytes, (b) => {
        const code = generateBagCode(b);
        expect(code).toHaveLength(bagCodeDataLength + 1);
        expect(parseBagCode(code)).toEqual({ ok: true, code });
        expect(parseBagCode(formatBagCode(code).toLowerCase())).toEqual({ ok: true, code });
        expect(parseBagCode(` ${code.slice(0, 3)} ${code.slice(3)} `)).toEqual({ ok: true, code });
      }),
    );
  });

  it("is pure: the same bytes give the same code", () => {
    const b = new Uint8Array([1, 2, 3, 4, 5, 6]);
    expect(generateBagCode(b)).toBe("123456" + computeCheckSymbol("123456"));
    expect(generateBagCode(b)).toBe(generateBagCode(b));
  });

  it("formats with one hyphen for reading aloud", () => {
    expect(formatBagCode("K7M4QZX")).toBe("K7M-4QZX");
  });

  it("folds confusable letters: O→0, I/L→1", () => {
    const code = "0011AB" + computeCheckSymbol("0011AB");
    expect(parseBagCode(`oOiL-ab${code.slice(-1)}`)).toEqual({ ok: true, code });
    expect(normalizeCrockford("oil-O")).toBe("0110");
  });

  it("catches every single wrong character and every adjacent swap (spec claim, property)", () => {
    fc.assert(
      fc.property(bytes, fc.nat({ max: bagCodeDataLength }), fc.nat({ max: 31 }), (b, pos, sym) => {
        const code = generateBagCode(b);
        const chars = code.split("");
        const replacement = pos === bagCodeDataLength ? crockfordCheckSymbols[sym] : crockfordSymbols[sym];
        fc.pre(chars[pos] !== replacement);
        chars[pos] = replacement;
        expect(parseBagCode(chars.join("")).ok).toBe(false);
        const swapAt = pos % (bagCodeDataLength - 1);
        const swapped = code.split("");
        [swapped[swapAt], swapped[swapAt + 1]] = [swapped[swapAt + 1], swapped[swapAt]];
        if (swapped[swapAt] !== swapped[swapAt + 1]) expect(parseBagCode(swapped.join("")).ok).toBe(false);
      }),
    );
  });

  it.each([
    ["", "empty"],
    ["ABC", "wrong_length"],
    ["ABCDEFGH1", "wrong_length"],
    ["AB#DEF1", "bad_character"],
    ["ABUDEF1", "bad_character"], // U is only a check symbol (spec)
    ["AB*DEF1", "bad_character"],
  ])("refuses %j (%s)", (text, reason) => {
    const r = parseBagCode(text);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toBe(reason);
  });

  it("refuses a wrong check symbol with a calm message", () => {
    const code = generateBagCode(new Uint8Array([9, 8, 7, 6, 5, 4]));
    const wrong = code.slice(0, -1) + (code.endsWith("0") ? "1" : "0");
    const r = parseBagCode(wrong);
    expect(r).toMatchObject({ ok: false, reason: "wrong_check" });
    if (!r.ok) expect(r.message).toMatch(/mistyped/);
  });

  it("suggests the known codes one typo or one swap away", () => {
    const known = ["7K3M9QD", "7K3M9QE", "ZZZZZZZ", "K73M9QD"].map((c) => c.slice(0, 6) + computeCheckSymbol(c.slice(0, 6)));
    const target = known[0];
    const typo = "7K3N" + target.slice(4); // M typed as N
    expect(suggestBagCodes(typo, known)).toContain(target);
    const swap = target[1] + target[0] + target.slice(2);
    expect(suggestBagCodes(swap, known)).toContain(target);
    expect(suggestBagCodes("0000000", known)).toEqual([]);
    expect(suggestBagCodes(target.toLowerCase(), known)).toEqual(known.filter((k) => k !== target && [...k].filter((c, i) => c !== target[i]).length === 1));
  });
});
