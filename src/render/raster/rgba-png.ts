import sharp from "sharp";

/**
 * Encode RGBA bytes (row-major from the top, 4 per pixel) as a PNG with sharp and return it
 * as a data: URI, so a figure carries its own image and the page fetches nothing.
 * `png`: the encoder's settings (default zlib level 9 with adaptive row filters). Smooth
 * colour ramps such as the wave field compress better without the filters, and far faster:
 * WAVE_FIELD_PNG.
 */
export async function rgbaPngDataUri(rgba: Uint8Array, width: number, height: number, png: { compressionLevel: number; adaptiveFiltering: boolean } = { compressionLevel: 9, adaptiveFiltering: true }): Promise<string> {
  const bytes = await sharp(Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength), { raw: { width, height, channels: 4 } })
    .png(png)
    .toBuffer();
  return `data:image/png;base64,${bytes.toString("base64")}`;
}

/**
 * PNG settings of the wave field figure: zlib level 6, no row filters. On the demo's 12 fields
 * (1440 × 644 each) 1.27 MB in 0.16 s of CPU, against 1.75 MB in 1.28 s with level 9 and
 * adaptive filters (and 1.25 MB in 0.54 s with level 9 unfiltered).
 */
export const WAVE_FIELD_PNG = { compressionLevel: 6, adaptiveFiltering: false } as const;
