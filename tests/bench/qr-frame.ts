// A camera frame showing a label's QR code, drawn from the `qrcode` package's module matrix (the package that
// prints the labels): the grey-scale (Y) plane the QR decode benchmark reads. The browser suites' fake camera
// video is written by qr-camera.ts from the label actually printed.
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
