import { open } from 'node:fs/promises';
import { imageSize } from 'image-size';
import type { RejectCode } from '../../shared/ingest';

/** What the first bytes of an uploaded file say it is. */
export type Sniffed =
  { ok: true; width: number; height: number } | { ok: false; code: RejectCode; message: string };

const HEAD_BYTES = 512 * 1024;

function startsWith(buf: Buffer, bytes: number[], offset = 0): boolean {
  return bytes.every((b, i) => buf[offset + i] === b);
}

function videoKind(head: Buffer): string | null {
  if (head.length >= 12 && head.toString('latin1', 4, 8) === 'ftyp') {
    const brand = head.toString('latin1', 8, 12);
    if (brand.startsWith('hei') || brand.startsWith('mif1') || brand === 'heix')
      return 'HEIC photo';
    return 'video clip (MP4/MOV)';
  }
  if (head.toString('latin1', 0, 4) === 'RIFF' && head.toString('latin1', 8, 12) === 'AVI ')
    return 'video clip (AVI)';
  if (startsWith(head, [0x1a, 0x45, 0xdf, 0xa3])) return 'video clip (MKV/WebM)';
  return null;
}

async function readEdges(path: string, size: number): Promise<{ head: Buffer; tail: Buffer }> {
  const handle = await open(path, 'r');
  try {
    const head = Buffer.alloc(Math.min(size, HEAD_BYTES));
    await handle.read(head, 0, head.length, 0);
    const tailLength = Math.min(size, 4096);
    const tail = Buffer.alloc(tailLength);
    await handle.read(tail, 0, tailLength, size - tailLength);
    return { head, tail };
  } finally {
    await handle.close();
  }
}

/** A complete JPEG ends with the EOI marker (FF D9), possibly followed by padding. */
function hasJpegEnd(tail: Buffer): boolean {
  let end = tail.length;
  while (end > 0 && (tail[end - 1] === 0x00 || tail[end - 1] === 0xff)) {
    if (end >= 2 && tail[end - 2] === 0xff && tail[end - 1] === 0xd9) return true;
    end--;
  }
  for (let i = end - 2; i >= Math.max(0, end - 64); i--) {
    if (tail[i] === 0xff && tail[i + 1] === 0xd9) return true;
  }
  return false;
}

/**
 * Checks a stored upload by its bytes, never by the name or the client's claimed type: JPEG only,
 * complete, and within the pixel cap (a header claiming enormous dimensions is a decompression bomb).
 */
export async function sniffUpload(
  path: string,
  size: number,
  maxMegapixels: number,
): Promise<Sniffed> {
  if (size === 0) return { ok: false, code: 'empty_file', message: 'The file is empty (0 bytes).' };
  const { head, tail } = await readEdges(path, size);
  const video = videoKind(head);
  if (video) {
    return {
      ok: false,
      code: 'unsupported_format',
      message: `This is a ${video}; only JPEG photos are supported yet.`,
    };
  }
  let type: string | undefined;
  let width = 0;
  let height = 0;
  try {
    const dims = imageSize(head);
    type = dims.type;
    width = dims.width ?? 0;
    height = dims.height ?? 0;
  } catch {
    return {
      ok: false,
      code: 'not_an_image',
      message: 'This file is not a photo (its content is not an image).',
    };
  }
  if (width * height > maxMegapixels * 1_000_000) {
    return {
      ok: false,
      code: 'too_many_pixels',
      message: `The image claims ${width}×${height} pixels, more than the ${maxMegapixels}-megapixel limit.`,
    };
  }
  if (type !== 'jpg') {
    return {
      ok: false,
      code: 'unsupported_format',
      message: `This is a ${String(type).toUpperCase()} image; only JPEG photos are supported yet.`,
    };
  }
  if (!width || !height) {
    return {
      ok: false,
      code: 'unreadable',
      message: 'The photo’s size could not be read; the file may be damaged.',
    };
  }
  if (!hasJpegEnd(tail)) {
    return {
      ok: false,
      code: 'truncated',
      message: 'The photo is cut off (the file ends too early); copy it from the card again.',
    };
  }
  return { ok: true, width, height };
}
