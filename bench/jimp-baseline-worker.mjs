// Worker thread of the ingest benchmark's baseline: stock Jimp with its default (pure JavaScript)
// JPEG codec doing what the server's derivative job does — decode, a 1600 px preview, a 320 px
// thumbnail from the preview, two JPEG encodes — so the server's pipeline can be compared with it.
import { readFile } from 'node:fs/promises';
import { performance } from 'node:perf_hooks';
import { Jimp } from 'jimp';

function fit(width, height, max) {
  return width >= height ? { w: max } : { h: max };
}

export default async function stockJimp({ path }) {
  const started = performance.now();
  const image = await Jimp.fromBuffer(await readFile(path));
  const { width, height } = image.bitmap;
  image.resize(fit(width, height, 1600));
  const preview = await image.getBuffer('image/jpeg', { quality: 80 });
  image.resize(fit(image.bitmap.width, image.bitmap.height, 320));
  const thumb = await image.getBuffer('image/jpeg', { quality: 75 });
  return {
    ms: performance.now() - started,
    width,
    height,
    previewBytes: preview.length,
    thumbBytes: thumb.length,
  };
}
