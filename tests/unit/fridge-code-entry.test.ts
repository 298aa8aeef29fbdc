import { describe, expect, it } from "vitest";
import QRCode from "qrcode";
import { buildLabelPayload, readLabelPayload } from "@/lib/domain/label-payload";
import { indexFarmCodes, lookUpScannedText, lookUpTypedCode } from "@/components/scan/code-entry";
import { classifyCameraError, describeCameraTrouble } from "@/components/scan/camera-trouble";

// Check symbols are worked out here independently of lib/domain, straight from Douglas Crockford's
// "Base 32" (crockford.com/base32.html): the check symbol encodes the code's value modulo 37, with
// * ~ $ = U standing for 32–36.
const alphabet = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";
const checkAlphabet = alphabet + "*~$=U";
function withCheck(data: string): string {
  let value = 0n;
  for (const ch of data) value = value * 32n + BigInt(alphabet.indexOf(ch));
  return data + checkAlphabet[Number(value % 37n)];
}

const codeA = withCheck("K7M4QZ");
const codeB = withCheck("H2B9TR");
const codeC = withCheck("00000Z"); // value 31 → check "Z"
const farm = indexFarmCodes([
  { id: "bag-a", code: codeA },
  { id: "bag-b", code: codeB },
  { id: "bag-c", code: codeC },
  { id: "bag-gone", code: withCheck("QQQQQQ"), deleted_at: "2026-01-01T00:00:00Z" },
]);

describe("typed codes", () => {
  it("the independent check symbol agrees with the spec's small values", () => {
    expect(withCheck("00000Z")).toBe("00000ZZ"); // 31 mod 37 = 31 → Z
    expect(withCheck("000010")).toBe("000010*"); // 32 → "*" (spec: 32 is *)
    expect(withCheck("000011")).toBe("000011~"); // 33 → "~" (spec: 33 is ~)
    expect(withCheck("000015")).toBe("0000150"); // 37 mod 37 = 0 → "0"
  });

  it.each([
    [codeA, "bag-a"],
    [codeA.toLowerCase(), "bag-a"], // the spec accepts lower case
    [`${codeA.slice(0, 3)}-${codeA.slice(3)}`, "bag-a"], // and ignores hyphens
    [` ${codeB} `, "bag-b"],
    [codeC.replace(/0/g, "O"), "bag-c"], // O read as 0 (spec)
  ])("finds %j", (typed, bagId) => {
    expect(lookUpTypedCode(typed, farm)).toMatchObject({ kind: "found", bagId });
  });

  it("catches a single mistyped character with the check symbol and offers the farm's code", () => {
    const typo = codeA.slice(0, 2) + (codeA[2] === "X" ? "Y" : "X") + codeA.slice(3);
    const r = lookUpTypedCode(typo, farm);
    expect(r.kind).toBe("invalid");
    if (r.kind !== "invalid") return;
    expect(r.message).toMatch(/mistyped/);
    expect(r.suggestions).toEqual([`${codeA.slice(0, 3)}-${codeA.slice(3)}`]);
    expect(r.message).toContain(`Did you mean ${r.suggestions[0]}?`);
  });

  it("catches two swapped neighbours and suggests the code", () => {
    const swapped = codeB[1] + codeB[0] + codeB.slice(2);
    const r = lookUpTypedCode(swapped, farm);
    expect(r).toMatchObject({ kind: "invalid", suggestions: [`${codeB.slice(0, 3)}-${codeB.slice(3)}`] });
  });

  it("says the length is wrong in plain words", () => {
    expect(lookUpTypedCode(codeA.slice(0, 5), farm)).toMatchObject({ kind: "invalid", message: expect.stringMatching(/8 characters \(7 on older labels\); this one has 5/) });
    expect(lookUpTypedCode("", farm)).toMatchObject({ kind: "invalid", suggestions: [] });
  });

  it("a valid code that is not on this farm (or was removed) says so plainly", () => {
    const other = withCheck("ABCDEF");
    expect(lookUpTypedCode(other, farm)).toEqual({ kind: "unknown", code: other, message: `No bag with code ${other.slice(0, 3)}-${other.slice(3)} on this farm.` });
    expect(lookUpTypedCode(withCheck("QQQQQQ"), farm).kind).toBe("unknown");
  });
});

describe("label QR payload", () => {
  it("is a link to the check sheet that round-trips to the code", () => {
    const payload = buildLabelPayload(codeA.toLowerCase(), "https://rimebook.example/");
    expect(payload).toBe(`https://rimebook.example/check?code=${encodeURIComponent(codeA)}`);
    expect(readLabelPayload(payload)).toEqual({ ok: true, code: codeA });
  });

  it("round-trips every check symbol, including the URL-reserved ones ($ and =)", () => {
    for (const sym of checkAlphabet) {
      // Find a data part whose check symbol is `sym` (values 0..36 of "00000X" cover them all mod 37).
      let data = "";
      for (let v = 0; v < 32 * 32 && !data; v++) {
        const d = `0000${alphabet[v >> 5]}${alphabet[v & 31]}`;
        if (withCheck(d).endsWith(sym)) data = d;
      }
      const code = withCheck(data);
      expect(readLabelPayload(buildLabelPayload(code, "http://localhost:3000"))).toEqual({ ok: true, code });
    }
  });

  it("survives the QR encoder: the text in the symbol is the payload byte for byte", () => {
    const payload = buildLabelPayload(codeB, "http://localhost:3000");
    const qr = QRCode.create(payload, { errorCorrectionLevel: "M" });
    const text = qr.segments.map((s: { data: Uint8Array | string }) => (typeof s.data === "string" ? s.data : Buffer.from(s.data).toString("utf8"))).join("");
    expect(text).toBe(payload);
    expect(qr.modules.size).toBeGreaterThanOrEqual(21);
  });

  it.each([
    [`rimebook:bag:${codeC}`, codeC],
    [`RIMEBOOK:BAG:${codeC.toLowerCase()}`, codeC],
    [codeB, codeB], // a bare code with a good check symbol
    [`https://other.example/farm/check/?code=${codeA}`, codeA], // a label printed from another address still reads
  ])("reads %j", (text, code) => {
    expect(readLabelPayload(text)).toEqual({ ok: true, code });
  });

  it.each([
    "https://example.org/menu",
    "https://example.org/check?id=1",
    "hello world",
    "",
    "K7M", // too short to be a code, so not taken for one
  ])("refuses %j as not a Rimebook label", (text) => {
    expect(readLabelPayload(text)).toMatchObject({ ok: false, reason: "not_rimebook" });
  });

  it("a Rimebook link with a damaged code says the code cannot be read", () => {
    expect(readLabelPayload("http://localhost:3000/check?code=K7M4QZ")).toMatchObject({ ok: false, reason: "bad_code" });
  });

  it("the scanner finds the farm's bag, names an unknown code, and ignores other QR codes", () => {
    expect(lookUpScannedText(buildLabelPayload(codeA, "http://x.test"), farm)).toMatchObject({ kind: "found", bagId: "bag-a" });
    const other = withCheck("ZZZZZZ");
    expect(lookUpScannedText(buildLabelPayload(other, "http://x.test"), farm)).toMatchObject({ kind: "unknown", message: expect.stringContaining("on this farm") });
    expect(lookUpScannedText("https://example.org/", farm).kind).toBe("not_label");
  });
});

describe("camera trouble", () => {
  // Error names from W3C Media Capture and Streams (getUserMedia); the "…Error" aliases are older Chrome's.
  it.each([
    ["NotAllowedError", "denied"],
    ["PermissionDeniedError", "denied"],
    ["SecurityError", "denied"],
    ["NotFoundError", "absent"],
    ["OverconstrainedError", "absent"],
    ["NotReadableError", "busy"],
    ["TypeError", "failed"],
  ])("%s → %s, with typed entry offered", (name, kind) => {
    const trouble = describeCameraTrouble(classifyCameraError(Object.assign(new Error("x"), { name })));
    expect(trouble.kind).toBe(kind);
    expect(trouble.text).toMatch(/type the code/i);
  });

  it("copes with something that is not an error at all", () => {
    expect(classifyCameraError(undefined)).toBe("failed");
  });
});
