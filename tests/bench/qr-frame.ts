// A fake camera for Chromium: a Y4M video whose frames show a QR code drawn from the `qrcode` package's
// module matrix (the same package that prints the labels). Chromium plays it as the camera with
// --use-file-for-fake-video-capture. The luminance frame is also what the QR decode benchmark reads.
import fs from "node:fs";
import QRCode from "qrcode";

export const FRAME_WIDTH = 640;
export const FRAME_HEIGHT = 480;

/** A grey-scale (Y plane) frame: white paper, black modules, centred, with a quiet zone of 4 modules. */
export function qrFrameLuma(text: string, opts: { width?: number; height?: number; moduleSize?: number } = {}): Uint8Array {
  const width = opts.width ?? FRAME_WIDTH;
  const height = opts.height ?? FRAME_HEIGHT;
  const qr = QRCode.create(text, { errorCorrectionLevel: "M" });
  const n = qr.modules.size;
  const moduleSize = opts.moduleSize ?? Math.max(2, Math.floor((Math.min(width, height) * 0.8) / (n + 8)));
  const side = n * moduleSize;
  const x0 = Math.floor((width - side) / 2);
  const y0 = Math.floor((height - side) / 2);
  const luma = new Uint8Array(width * height).fill(235);
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) {
      if (!qr.modules.get(r, c)) continue;
      for (let dy = 0; dy < moduleSize; dy++) {
        const row = (y0 + r * moduleSize + dy) * width + x0 + c * moduleSize;
        luma.fill(16, row, row + moduleSize);
      }
    }
  }
  return luma;
}

/** Writes a Y4M file (4:2:0, grey chroma) repeating the frame; Chromium loops it. */
export function writeY4m(file: string, luma: Uint8Array, opts: { width?: number; height?: number; frames?: number } = {}): string {
  const width = opts.width ?? FRAME_WIDTH;
  const height = opts.height ?? FRAME_HEIGHT;
  const chroma = Buffer.alloc((width / 2) * (height / 2) * 2, 128);
  const frame = Buffer.concat([Buffer.from("FRAME\n"), Buffer.from(luma), chroma]);
  const frames = opts.frames ?? 10;
  const header = Buffer.from(`YUV4MPEG2 W${width} H${height} F10:1 Ip A1:1 C420jpeg\n`);
  fs.writeFileSync(file, Buffer.concat([header, ...Array.from({ length: frames }, () => frame)]));
  return file;
}

/** A fake-camera video showing `text` as a QR code. */
export function writeQrVideo(file: string, text: string): string {
  return writeY4m(file, qrFrameLuma(text));
}
