import { describe, expect, it } from "vitest";
import QRCode from "qrcode";
import { drawQr, pageLabels } from "@/components/labels/label-data";
import { buildLabelPayload } from "@/lib/domain/label-payload";

// QR geometry per ISO/IEC 18004: a version-v symbol has 17 + 4v modules per side, and a quiet zone of four modules.
describe("label QR drawing", () => {
  const payload = buildLabelPayload("K7M4QZ0", "https://rimebook.example"); // the check symbol does not matter here
  const drawn = drawQr(payload);
  const { modules, version } = QRCode.create(payload, { errorCorrectionLevel: "M" });

  it("has 17 + 4·version modules plus the four-module quiet zone each side", () => {
    expect(modules.size).toBe(17 + 4 * version);
    expect(drawn.size).toBe(modules.size + 8);
  });

  it("paints exactly the dark modules, at their own positions", () => {
    const painted = new Set<string>();
    for (const m of drawn.path.matchAll(/M(\d+) (\d+)h(\d+)v1h-\d+z/g)) {
      const [x, y, w] = [Number(m[1]), Number(m[2]), Number(m[3])];
      for (let i = 0; i < w; i++) painted.add(`${x + i - 4},${y - 4}`);
    }
    let dark = 0;
    for (let y = 0; y < modules.size; y++)
      for (let x = 0; x < modules.size; x++) {
        if (modules.get(y, x)) {
          dark++;
          expect(painted.has(`${x},${y}`)).toBe(true);
        }
      }
    expect(painted.size).toBe(dark);
    // The three finder patterns: the top-left, top-right and bottom-left corners are dark.
    expect(painted.has("0,0") && painted.has(`${modules.size - 1},0`) && painted.has(`0,${modules.size - 1}`)).toBe(true);
  });
});

describe("pages", () => {
  it("puts 21 labels on an A4 sheet (3 × 7) and one per page on rolls", () => {
    const labels = Array.from({ length: 45 }, (_, i) => i);
    expect(pageLabels(labels, "a4").map((p) => p.length)).toEqual([21, 21, 3]);
    expect(pageLabels(labels, "small")).toHaveLength(45);
    expect(pageLabels([], "large")).toEqual([]);
  });
});
