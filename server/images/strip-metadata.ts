/**
 * A JPEG without its metadata segments: APP1 (EXIF with the camera's GPS position, and XMP),
 * APP13 (IPTC) and comments are dropped byte for byte; the image data are not re-encoded. Used
 * where a role may see a photo but not the exact place it was taken.
 */
export function stripJpegMetadata(jpeg: Buffer): Buffer {
  if (jpeg.length < 4 || jpeg[0] !== 0xff || jpeg[1] !== 0xd8) return jpeg;
  const keep: Buffer[] = [jpeg.subarray(0, 2)];
  let at = 2;
  while (at + 4 <= jpeg.length) {
    if (jpeg[at] !== 0xff) break;
    const marker = jpeg[at + 1]!;
    // Start of scan: everything from here on is image data.
    if (marker === 0xda) break;
    // Fill bytes and markers without a length.
    if (marker === 0xff) {
      at++;
      continue;
    }
    if (marker === 0x01 || (marker >= 0xd0 && marker <= 0xd7)) {
      keep.push(jpeg.subarray(at, at + 2));
      at += 2;
      continue;
    }
    const length = jpeg.readUInt16BE(at + 2);
    const end = at + 2 + length;
    if (length < 2 || end > jpeg.length) break;
    const drop = marker === 0xe1 || marker === 0xed || marker === 0xfe;
    if (!drop) keep.push(jpeg.subarray(at, end));
    at = end;
  }
  keep.push(jpeg.subarray(at));
  return Buffer.concat(keep);
}
