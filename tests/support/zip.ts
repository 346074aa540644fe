import type { Response } from 'superagent';
import yauzl from 'yauzl';

/** Supertest parser that keeps a response body as a Buffer (zip, xlsx, images). */
export function binaryParser(
  response: Response,
  done: (err: Error | null, body: unknown) => void,
): void {
  // In Node, superagent hands the parser the raw response stream.
  const res = response as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => done(null, Buffer.concat(chunks)));
  res.on('error', (err: Error) => done(err, Buffer.alloc(0)));
}

/** Every entry of a zip held in memory, by name (read with yauzl directly, not the app's reader). */
export async function unzip(bytes: Buffer): Promise<Map<string, Buffer>> {
  const zip = await new Promise<yauzl.ZipFile>((resolve, reject) =>
    yauzl.fromBuffer(bytes, { lazyEntries: true }, (err, z) =>
      err || !z ? reject(err) : resolve(z),
    ),
  );
  const out = new Map<string, Buffer>();
  await new Promise<void>((resolve, reject) => {
    zip.on('entry', (entry: yauzl.Entry) => {
      zip.openReadStream(entry, (err, stream) => {
        if (err || !stream) return reject(err);
        const chunks: Buffer[] = [];
        stream.on('data', (c: Buffer) => chunks.push(c));
        stream.on('end', () => {
          out.set(entry.fileName, Buffer.concat(chunks));
          zip.readEntry();
        });
      });
    });
    zip.on('end', resolve);
    zip.on('error', reject);
    zip.readEntry();
  });
  return out;
}
