// The browser suite's fake camera (tests/e2e/support/qr-camera.ts) must show a label the way a hand does, so
// the scanner test fails only when the scanner fails. Decodes the written video with the same QR library the
// scanner uses (@zxing/library, under @zxing/browser) for random bag codes.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { BinaryBitmap, HybridBinarizer, QRCodeReader, RGBLuminanceSource } from "@zxing/library";
import { generateBagCode } from "@/lib/domain/bag-codes";
import { buildLabelPayload } from "@/lib/domain/label-payload";
import { drawQr } from "@/components/labels/label-data";
import { matrixFromLabelPath, writeQrVideo } from "../e2e/support/qr-camera";

/** The luma planes of a 4:2:0 Y4M file. */
function readLumaFrames(file: string): { width: number; height: number; frames: Uint8ClampedArray[] } {
  const buf = fs.readFileSync(file);
  const headerEnd = buf.indexOf(0x0a);
  const header = buf.subarray(0, headerEnd).toString();
  const width = Number(/ W(\d+)/.exec(header)![1]);
  const height = Number(/ H(\d+)/.exec(header)![1]);
  const frameBytes = "FRAME\n".length + width * height * 1.5;
  const frames: Uint8ClampedArray[] = [];
  for (let at = headerEnd + 1; at + frameBytes <= buf.length; at += frameBytes) {
    expect(buf.subarray(at, at + 6).toString()).toBe("FRAME\n");
    frames.push(new Uint8ClampedArray(buf.subarray(at + 6, at + 6 + width * height)));
  }
  return { width, height, frames };
}

function decode(luma: Uint8ClampedArray, width: number, height: number): string | null {
  try {
    return new QRCodeReader().decode(new BinaryBitmap(new HybridBinarizer(new RGBLuminanceSource(luma, width, height)))).getText();
  } catch {
    return null;
  }
}

describe("the fake camera's label video", () => {
  it("reads back, for every one of 40 spread-out bag codes, in at least one pose", () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-camera-"));
    try {
      const unread: string[] = [];
      for (let i = 0; i < 40; i++) {
        // Fixed pseudo-random bytes (a small LCG): the same 40 codes every run, so a pass is not luck.
        const code = generateBagCode(Uint8Array.from({ length: 7 }, (_, k) => ((i + 1) * 2654435761 + k * 40503) % 251));
        const text = buildLabelPayload(code, `http://127.0.0.1:${30000 + i * 577}`);
        const { size, path: d } = drawQr(text);
        const file = path.join(dir, `${code.replace(/[^A-Z0-9]/g, "_")}.y4m`);
        writeQrVideo(file, matrixFromLabelPath(d, size));
        const { width, height, frames } = readLumaFrames(file);
        expect(frames.length).toBeGreaterThan(1);
        // Each pose repeats for a few frames; decoding every third frame covers every pose once.
        const read = frames.filter((_, k) => k % 3 === 0).map((f) => decode(f, width, height));
        if (!read.includes(text)) unread.push(text);
      }
      expect(unread).toEqual([]);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);
});
