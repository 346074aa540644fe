/**
 * Compact binary form of a feature set for a SQLite BLOB. Little-endian:
 *   "MCPF", format u8, flags u8 (bit 0: mirrored view present), vocabulary id (u8 length + ASCII),
 *   working width u16, height u16, crop x, y, width, height u16, photo width, height u16,
 *   then per view: count u16, points (u16 x, u16 y as fractions of
 *   65535), descriptors (count × 32 bytes), words (count × u16).
 * About 38 bytes per keypoint; points lose at most 1/131070 of the crop to quantisation.
 */
import { DESCRIPTOR_BYTES } from './hamming';
import type { FeatureSet, FeatureView } from './types';

const MAGIC = 0x4650434d; // "MCPF" read as a little-endian u32
const FORMAT = 1;
const Q = 65535;

function viewBytes(view: FeatureView): number {
  const n = view.points.length / 2;
  return 2 + n * (4 + DESCRIPTOR_BYTES + 2);
}

function checkView(view: FeatureView): number {
  const n = view.points.length / 2;
  if (!Number.isInteger(n) || n > 0xffff) throw new RangeError(`cannot store ${n} keypoints`);
  if (view.descriptors.length !== n * DESCRIPTOR_BYTES) {
    throw new RangeError('descriptor count does not match keypoint count');
  }
  if (view.words.length !== n && view.words.length !== 0) {
    throw new RangeError('word count does not match keypoint count');
  }
  return n;
}

function writeView(buf: Buffer, at: number, view: FeatureView): number {
  const n = checkView(view);
  let o = buf.writeUInt16LE(n, at);
  for (let i = 0; i < n * 2; i++) {
    o = buf.writeUInt16LE(Math.round(Math.min(1, Math.max(0, view.points[i])) * Q), o);
  }
  buf.set(view.descriptors, o);
  o += view.descriptors.length;
  // A view without words (vocabulary training) stores word 0; deserialise then reports no words.
  for (let i = 0; i < n; i++) o = buf.writeUInt16LE(view.words[i] ?? 0, o);
  return o;
}

/** Serialises a feature set to a Buffer. */
export function serializeFeatures(features: FeatureSet): Buffer {
  const id = Buffer.from(features.vocabulary, 'ascii');
  if (id.length > 255) throw new RangeError('vocabulary id longer than 255 bytes');
  const views = features.mirrored ? [features.plain, features.mirrored] : [features.plain];
  const size = 4 + 2 + 1 + id.length + 16 + views.reduce((s, v) => s + viewBytes(v), 0);
  const buf = Buffer.alloc(size);
  let o = buf.writeUInt32LE(MAGIC, 0);
  o = buf.writeUInt8(FORMAT, o);
  o = buf.writeUInt8(features.mirrored ? 1 : 0, o);
  o = buf.writeUInt8(id.length, o);
  o += id.copy(buf, o);
  const { crop } = features;
  for (const v of [features.width, features.height, crop.x, crop.y, crop.width, crop.height]) {
    o = buf.writeUInt16LE(v, o);
  }
  o = buf.writeUInt16LE(features.photoWidth, o);
  o = buf.writeUInt16LE(features.photoHeight, o);
  for (const v of views) o = writeView(buf, o, v);
  return buf;
}

function readView(buf: Buffer, at: number, hasWords: boolean): [FeatureView, number] {
  const n = buf.readUInt16LE(at);
  let o = at + 2;
  if (buf.length < o + n * (4 + DESCRIPTOR_BYTES + 2))
    throw new RangeError('feature blob is truncated');
  const points = new Float32Array(n * 2);
  for (let i = 0; i < n * 2; i++, o += 2) points[i] = buf.readUInt16LE(o) / Q;
  const descriptors = new Uint8Array(buf.subarray(o, o + n * DESCRIPTOR_BYTES));
  o += n * DESCRIPTOR_BYTES;
  const words = new Uint16Array(hasWords ? n : 0);
  for (let i = 0; i < n; i++, o += 2) if (hasWords) words[i] = buf.readUInt16LE(o);
  return [{ points, descriptors, words }, o];
}

/** Reads back a feature set written by serializeFeatures. */
export function deserializeFeatures(blob: Uint8Array): FeatureSet {
  const buf = Buffer.from(blob.buffer, blob.byteOffset, blob.byteLength);
  if (buf.length < 7 || buf.readUInt32LE(0) !== MAGIC) throw new RangeError('not a feature blob');
  if (buf.readUInt8(4) !== FORMAT)
    throw new RangeError(`unknown feature format ${buf.readUInt8(4)}`);
  const flags = buf.readUInt8(5);
  const idLength = buf.readUInt8(6);
  let o = 7;
  const vocabulary = buf.toString('ascii', o, o + idLength);
  o += idLength;
  if (buf.length < o + 16) throw new RangeError('feature blob is truncated');
  const [width, height, x, y, cw, ch, photoWidth, photoHeight] = Array.from({ length: 8 }, (_, k) =>
    buf.readUInt16LE(o + 2 * k),
  );
  o += 16;
  const hasWords = vocabulary !== '';
  const [plain, afterPlain] = readView(buf, o, hasWords);
  const mirrored = flags & 1 ? readView(buf, afterPlain, hasWords)[0] : null;
  const crop = { x, y, width: cw, height: ch };
  return { vocabulary, width, height, crop, photoWidth, photoHeight, plain, mirrored };
}

/** A reference's stored form: the plain view only (references are never flipped). */
export function referenceOnly(features: FeatureSet): FeatureSet {
  return { ...features, mirrored: null };
}
