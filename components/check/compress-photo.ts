// Photos are shrunk on the phone before they are stored: a 12-megapixel shot is 3–6 MB, and the
// queue may hold many of them until there is signal. 1600 px on the long side at JPEG quality 0.8
// keeps mould and roots recognisable at a few hundred kB.

export const photoMaxSide = 1600;
export const photoQuality = 0.8;

/** Size that fits within `max` on the long side, keeping the aspect ratio; never enlarges. */
export function fitWithin(width: number, height: number, max = photoMaxSide): { width: number; height: number } {
  if (width <= 0 || height <= 0) throw new Error("The photo has no size.");
  const scale = Math.min(1, max / Math.max(width, height));
  return { width: Math.max(1, Math.round(width * scale)), height: Math.max(1, Math.round(height * scale)) };
}

/** Browser only: decodes the picked file (respecting its EXIF rotation), redraws it smaller and encodes JPEG. */
export async function compressPhoto(file: Blob): Promise<Blob> {
  if (!file.type.startsWith("image/")) throw new Error("That file is not a photo.");
  const bitmap = await createImageBitmap(file, { imageOrientation: "from-image" });
  try {
    const { width, height } = fitWithin(bitmap.width, bitmap.height);
    const canvas = document.createElement("canvas");
    canvas.width = width;
    canvas.height = height;
    const ctx = canvas.getContext("2d");
    if (!ctx) throw new Error("This browser cannot resize photos.");
    ctx.drawImage(bitmap, 0, 0, width, height);
    const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, "image/jpeg", photoQuality));
    if (!blob) throw new Error("The photo could not be saved; try taking it again.");
    return blob;
  } finally {
    bitmap.close();
  }
}
