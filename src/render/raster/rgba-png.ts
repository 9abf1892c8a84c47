import sharp from "sharp";

/**
 * Encode RGBA bytes (row-major from the top, 4 per pixel) as a PNG with sharp and return it
 * as a data: URI, so a figure carries its own image and the page fetches nothing.
 */
export async function rgbaPngDataUri(rgba: Uint8Array, width: number, height: number): Promise<string> {
  const png = await sharp(Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength), { raw: { width, height, channels: 4 } })
    .png({ compressionLevel: 9, adaptiveFiltering: true })
    .toBuffer();
  return `data:image/png;base64,${png.toString("base64")}`;
}
