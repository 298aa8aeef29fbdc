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

/** One pose of the label in front of the camera: pixels per module, tilt in degrees, offset from the centre. */
export type LabelPose = { scale: number; tilt: number; dx: number; dy: number };

// A label held by hand never sits pixel-aligned and still: each frame shows it at a slightly different size,
// tilt and place. This matters: @zxing/library misses a few percent of perfectly still, axis-aligned codes
// (about 1–5 % per pose, measured over random bag codes), and a real hand gives it fresh chances every frame.
const HAND_HELD: LabelPose[] = [
  { scale: 1, tilt: 0, dx: 0, dy: 0 },
  { scale: 0.93, tilt: 2, dx: 0, dy: 0 },
  { scale: 0.87, tilt: -3, dx: 7, dy: -5 },
  { scale: 1.04, tilt: 4, dx: -9, dy: 6 },
  { scale: 0.91, tilt: -1.5, dx: 3, dy: 8 },
  { scale: 0.82, tilt: 6, dx: -4, dy: -7 },
];

/** Draws the matrix on video white at one pose (luma plane only). */
function drawPose(matrix: QrMatrix, width: number, height: number, moduleSize: number, pose: LabelPose): Buffer {
  const y = Buffer.alloc(width * height, 235); // video white
  const n = matrix.length;
  const px = moduleSize * pose.scale;
  const a = (pose.tilt * Math.PI) / 180;
  const [cos, sin] = [Math.cos(a), Math.sin(a)];
  const [cx, cy] = [width / 2 + pose.dx, height / 2 + pose.dy];
  for (let row = 0; row < height; row++)
    for (let col = 0; col < width; col++) {
      const [x, v] = [col - cx, row - cy];
      const c = Math.floor((cos * x + sin * v) / px + n / 2);
      const r = Math.floor((-sin * x + cos * v) / px + n / 2);
      if (r >= 0 && c >= 0 && r < n && c < n && matrix[r][c]) y[row * width + col] = 16; // video black
    }
  return y;
}

/** Writes a short looping video of the label held in front of the camera, a few poses over and over. */
export function writeQrVideo(file: string, matrix: QrMatrix, opts: { width?: number; height?: number; moduleSize?: number; poses?: LabelPose[] } = {}): void {
  const width = opts.width ?? 640;
  const height = opts.height ?? 480;
  const moduleSize = opts.moduleSize ?? Math.floor((Math.min(width, height) * 0.8) / matrix.length);
  const chroma = Buffer.alloc((width / 2) * (height / 2) * 2, 128);
  const frames = (opts.poses ?? HAND_HELD).map((pose) => Buffer.concat([Buffer.from("FRAME\n"), drawPose(matrix, width, height, moduleSize, pose), chroma]));
  const header = Buffer.from(`YUV4MPEG2 W${width} H${height} F10:1 Ip A1:1 C420jpeg\n`);
  // Each pose held for three frames (0.3 s), like a hand settling.
  fs.writeFileSync(file, Buffer.concat([header, ...frames.flatMap((f) => [f, f, f])]));
}
