/**
 * JPEG encoding of painted frames with mozjpeg (WebAssembly, @jsquash/jpeg), through the same
 * codec module the server's workers use.
 */
import { encodeJpeg as encodeMozjpeg } from '../../server/images/codec';
import type { Raster } from './raster';

/** Encodes an RGBA raster as a baseline JPEG. */
export function encodeJpeg(img: Raster, quality: number): Promise<Buffer> {
  return encodeMozjpeg({ data: img.data, width: img.width, height: img.height }, quality);
}
