import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  bagCodeDataLength,
  computeCheckSymbol,
  computeDammCheck,
  crockfordCheckSymbols,
  crockfordSymbols,
  decodeCrockford,
  encodeCrockford,
  formatBagCode,
  generateBagCode,
  normalizeCrockford,
  legacyBagCodeDataLength,
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
    const b = new Uint8Array([1, 2, 3, 4, 5, 6, 7]);
    expect(generateBagCode(b)).toBe("1234567" + computeDammCheck("1234567"));
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

  // Damm, H. M. (2004), Total anti-symmetrische Quasigruppen, dissertation, Philipps-Universität Marburg:
  // x∘y = a·x ⊕ y over GF(2⁵) (modulus x⁵ + x² + 1, a = x) is totally anti-symmetric, so the check catches every
  // single substitution and every neighbour swap. The check is linear over GF(2⁵): the code's remainder after a
  // change is its old remainder (0) plus a term that depends only on the changed position(s) and their old and new
  // symbols. Trying every position with every pair of symbols therefore covers every code there is; the test
  // first confirms that linearity on random codes, then runs the whole enumeration.
  const symbols = [...crockfordSymbols];
  const codeOf = (chars: string[]) => chars.join("");

  it("new codes use only the 32 letters and digits, check character included", () => {
    fc.assert(
      fc.property(bytes, (b) => {
        const code = generateBagCode(b);
        expect(code).toMatch(/^[0-9A-HJKMNP-TV-Z]{8}$/);
      }),
    );
  });

  it("a change is caught or not whatever the rest of the code is (linearity, property)", () => {
    fc.assert(
      fc.property(bytes, bytes, fc.nat({ max: bagCodeDataLength }), fc.nat({ max: 31 }), (b1, b2, pos, sym) => {
        // Put the same symbol at the same place in two random valid codes: both stay valid or both fail.
        const a = generateBagCode(b1).split("");
        const c = generateBagCode(b2).split("");
        const deltaA = symbols.indexOf(a[pos]) ^ sym;
        const replacementC = symbols[symbols.indexOf(c[pos]) ^ deltaA];
        a[pos] = symbols[sym];
        c[pos] = replacementC;
        expect(parseBagCode(codeOf(a)).ok).toBe(parseBagCode(codeOf(c)).ok);
      }),
    );
  });

  /** A valid new code with the given symbols at the given places: the check follows, or, when the check
   *  character itself is set, the free data symbol just before the set places is chosen to produce it. */
  function validCodeWith(fixed: Record<number, string>): string {
    const chars = Array.from({ length: bagCodeDataLength + 1 }, () => "0");
    for (const [pos, sym] of Object.entries(fixed)) chars[Number(pos)] = sym;
    const data = () => codeOf(chars).slice(0, bagCodeDataLength);
    const wantedCheck = fixed[bagCodeDataLength];
    if (wantedCheck === undefined) {
      chars[bagCodeDataLength] = computeDammCheck(data());
    } else {
      const free = Math.min(...Object.keys(fixed).map(Number)) - 1;
      const found = symbols.some((sym) => {
        chars[free] = sym;
        return computeDammCheck(data()) === wantedCheck;
      });
      if (!found) throw new Error("every check value is reachable by changing one data symbol");
    }
    const code = codeOf(chars);
    expect(parseBagCode(code)).toEqual({ ok: true, code });
    return code;
  }

  it("catches every single wrong character at every place, exhaustively (Damm 2004)", () => {
    let tried = 0;
    for (let pos = 0; pos <= bagCodeDataLength; pos++) {
      for (const from of symbols) {
        const valid = validCodeWith({ [pos]: from });
        for (const to of symbols) {
          if (to === from) continue;
          const typo = valid.split("");
          typo[pos] = to;
          expect(parseBagCode(codeOf(typo))).toMatchObject({ ok: false, reason: "wrong_check" });
          tried++;
        }
      }
    }
    expect(tried).toBe((bagCodeDataLength + 1) * 32 * 31);
  });

  it("catches every swap of neighbours at every place, the check character included, exhaustively (Damm 2004)", () => {
    let tried = 0;
    for (let pos = 0; pos < bagCodeDataLength; pos++) {
      for (const x of symbols) {
        for (const y of symbols) {
          if (x === y) continue;
          const valid = validCodeWith({ [pos]: x, [pos + 1]: y });
          const swapped = valid.split("");
          [swapped[pos], swapped[pos + 1]] = [swapped[pos + 1], swapped[pos]];
          expect(parseBagCode(codeOf(swapped))).toMatchObject({ ok: false, reason: "wrong_check" });
          tried++;
        }
      }
    }
    expect(tried).toBe(bagCodeDataLength * 32 * 31);
  });

  it("the same two checks on random codes, every place and every symbol (property)", () => {
    fc.assert(
      fc.property(bytes, (b) => {
        const code = generateBagCode(b);
        for (let pos = 0; pos <= bagCodeDataLength; pos++) {
          for (const to of symbols) {
            if (to === code[pos]) continue;
            const typo = code.split("");
            typo[pos] = to;
            expect(parseBagCode(codeOf(typo)).ok).toBe(false);
          }
          if (pos < bagCodeDataLength && code[pos] !== code[pos + 1]) {
            const swapped = code.split("");
            [swapped[pos], swapped[pos + 1]] = [swapped[pos + 1], swapped[pos]];
            expect(parseBagCode(codeOf(swapped)).ok).toBe(false);
          }
        }
      }),
      { numRuns: 300 },
    );
  });

  describe("codes printed before the Damm check (6 symbols and a mod-37 check)", () => {
    const legacyBytes = fc.uint8Array({ minLength: legacyBagCodeDataLength, maxLength: legacyBagCodeDataLength });
    const legacyCode = (b: Uint8Array) => {
      const data = Array.from(b, (x) => crockfordSymbols[x & 31]).join("");
      return data + computeCheckSymbol(data);
    };

    it("still parse, typed in any case, with a hyphen, check symbols * ~ $ = U included", () => {
      fc.assert(
        fc.property(legacyBytes, (b) => {
          const code = legacyCode(b);
          expect(parseBagCode(code)).toEqual({ ok: true, code });
          expect(parseBagCode(formatBagCode(code).toLowerCase())).toEqual({ ok: true, code });
        }),
      );
      // 32 mod 37 = 32, so the body "000010" (value 32) carries the check symbol "*".
      expect(computeCheckSymbol("000010")).toBe("*");
      expect(parseBagCode("000-010*")).toEqual({ ok: true, code: "000010*" });
    });

    it("keep catching every single wrong character and every adjacent swap (Crockford, property)", () => {
      fc.assert(
        fc.property(legacyBytes, fc.nat({ max: legacyBagCodeDataLength }), fc.nat({ max: 31 }), (b, pos, sym) => {
          const code = legacyCode(b);
          const chars = code.split("");
          const replacement = pos === legacyBagCodeDataLength ? crockfordCheckSymbols[sym] : crockfordSymbols[sym];
          fc.pre(chars[pos] !== replacement);
          chars[pos] = replacement;
          expect(parseBagCode(chars.join("")).ok).toBe(false);
          const swapAt = pos % (legacyBagCodeDataLength - 1);
          const swapped = code.split("");
          [swapped[swapAt], swapped[swapAt + 1]] = [swapped[swapAt + 1], swapped[swapAt]];
          if (swapped[swapAt] !== swapped[swapAt + 1]) expect(parseBagCode(swapped.join("")).ok).toBe(false);
        }),
      );
    });
  });

  it.each([
    ["", "empty"],
    ["ABC", "wrong_length"],
    ["ABCDEFGHJ1", "wrong_length"],
    ["AB#DEF1", "bad_character"],
    ["ABUDEF1", "bad_character"], // U is only a check symbol (spec)
    ["AB*DEF1", "bad_character"],
  ])("refuses %j (%s)", (text, reason) => {
    const r = parseBagCode(text);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toBe(reason);
  });

  it("refuses a wrong check symbol with a calm message", () => {
    const code = generateBagCode(new Uint8Array([9, 8, 7, 6, 5, 4, 3]));
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
