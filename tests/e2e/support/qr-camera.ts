// A fake camera for Chromium (--use-file-for-fake-video-capture): a Y4M file whose frames show a QR code.
// Y4M is a one-line header then frames of "FRAME\n" + Y plane + U plane + V plane (4:2:0, 128 = no colour).
import fs from "node:fs";

/** Dark modules as a square matrix (true = dark), e.g. read back from a printed label's SVG. */
export type QrMatrix = boolean[][];

/** Reads the label's QR path ("M x y h w v1 h-w z" runs, quiet zone included) back into a module matrix. */
export function matrixFromLabelPath(path: string, size: number): QrMatrix {
  const m: QrMatrix = Array.from({ length: size }, () => Array<boolean>(size).fill(false));
  for (const run of path.matchAll(/M(\d+) (\d+)h(\d+)v1h-\d+z/g)) {
    const [x, y, w] = [Number(run[1]), Number(run[2]), Number(run[3])];
    for (let i = 0; i < w; i++) m[y][x + i] = true;
  }
  return m;
}

/** Writes `frames` identical frames of the matrix, centred on white, `scale` pixels per module. */
export function writeQrVideo(file: string, matrix: QrMatrix, opts: { width?: number; height?: number; scale?: number; frames?: number } = {}): void {
  const width = opts.width ?? 640;
  const height = opts.height ?? 480;
  const scale = opts.scale ?? Math.floor((Math.min(width, height) * 0.8) / matrix.length);
  const frames = opts.frames ?? 10;
  const y = Buffer.alloc(width * height, 235); // video white
  const side = matrix.length * scale;
  const x0 = Math.floor((width - side) / 2);
  const y0 = Math.floor((height - side) / 2);
  for (let r = 0; r < matrix.length; r++)
    for (let c = 0; c < matrix.length; c++) {
      if (!matrix[r][c]) continue;
      for (let dy = 0; dy < scale; dy++) y.fill(16, (y0 + r * scale + dy) * width + x0 + c * scale, (y0 + r * scale + dy) * width + x0 + (c + 1) * scale);
    }
  const chroma = Buffer.alloc((width / 2) * (height / 2) * 2, 128);
  const frame = Buffer.concat([Buffer.from("FRAME\n"), y, chroma]);
  const header = Buffer.from(`YUV4MPEG2 W${width} H${height} F10:1 Ip A1:1 C420jpeg\n`);
  fs.writeFileSync(file, Buffer.concat([header, ...Array.from({ length: frames }, () => frame)]));
}
