import "server-only";
import fs from "node:fs/promises";
import path from "node:path";
import { env } from "./env";

// Photos on local disk under UPLOAD_DIR/<farm id>/…; a hosted object store would slot in here.
// Paths stored in the database are relative to UPLOAD_DIR and built only from ids we issued.

const root = () => path.resolve(env.UPLOAD_DIR);
const safePart = (s: string) => {
  if (!/^[A-Za-z0-9-]+$/.test(s)) throw new Error(`unsafe storage path part: ${s}`);
  return s;
};

export const extensionFor: Record<string, string> = { "image/jpeg": "jpg", "image/png": "png", "image/webp": "webp" };

/** Stores bytes for a farm's photo; returns the relative path to keep in the photos row. */
export async function savePhotoFile(farmId: string, photoId: string, mime: string, bytes: Uint8Array): Promise<string> {
  const relative = path.join(safePart(farmId), `${safePart(photoId)}.${extensionFor[mime] ?? "bin"}`);
  const full = path.join(root(), relative);
  await fs.mkdir(path.dirname(full), { recursive: true });
  const tmp = `${full}.${process.pid}.tmp`;
  await fs.writeFile(tmp, bytes);
  await fs.rename(tmp, full); // never leave half a file under the final name
  return relative;
}

export async function readPhotoFile(relative: string): Promise<Buffer> {
  const full = path.resolve(root(), relative);
  if (!full.startsWith(root() + path.sep)) throw new Error("photo path escapes the upload folder");
  return fs.readFile(full);
}

export async function removePhotoFile(relative: string): Promise<void> {
  await fs.rm(path.resolve(root(), relative), { force: true });
}

/** What the bytes really are (magic numbers), whatever the file name or browser claims. */
export function sniffImage(bytes: Uint8Array): "image/jpeg" | "image/png" | "image/webp" | null {
  const at = (i: number) => bytes[i];
  if (bytes.length >= 3 && at(0) === 0xff && at(1) === 0xd8 && at(2) === 0xff) return "image/jpeg";
  if (bytes.length >= 8 && [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a].every((b, i) => at(i) === b)) return "image/png";
  const ascii = (from: number, to: number) => String.fromCharCode(...bytes.subarray(from, to));
  if (bytes.length >= 12 && ascii(0, 4) === "RIFF" && ascii(8, 12) === "WEBP") return "image/webp";
  return null;
}
