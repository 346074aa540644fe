import yauzl from 'yauzl';
import { ApiError } from '../../errors/api-error';

/** Reads every entry of a zip file into memory, by normalised path (for packages, not backups). */
export async function readZip(path: string, maxBytes: number): Promise<Map<string, Buffer>> {
  const zip = await new Promise<yauzl.ZipFile>((resolve, reject) =>
    yauzl.open(
      path,
      { lazyEntries: true, decodeStrings: true, validateEntrySizes: true },
      (err, z) => (err || !z ? reject(err) : resolve(z)),
    ),
  ).catch(() => {
    throw new ApiError('bad_request', 'The package is not a readable zip file.');
  });
  const files = new Map<string, Buffer>();
  let total = 0;
  await new Promise<void>((resolveAll, rejectAll) => {
    // Any failure of the zip reader (bad names such as ../x, corrupt entries) is the package's fault.
    const reject = (err: unknown) => {
      zip.close();
      rejectAll(
        err instanceof ApiError
          ? err
          : new ApiError(
              'bad_request',
              `The package could not be read: ${err instanceof Error ? err.message : String(err)}.`,
            ),
      );
    };
    const resolve = () => resolveAll();
    zip.on('entry', (entry: yauzl.Entry) => {
      const name = entry.fileName.replace(/^\.\/+/, '');
      if (name.endsWith('/') || name.includes('..') || name.startsWith('/')) return zip.readEntry();
      total += entry.uncompressedSize;
      if (total > maxBytes)
        return reject(
          new ApiError('bad_request', 'The package unpacks to more than the server accepts.'),
        );
      zip.openReadStream(entry, (err, stream) => {
        if (err || !stream) return reject(err ?? new Error('unreadable entry'));
        const chunks: Buffer[] = [];
        stream.on('data', (c: Buffer) => chunks.push(c));
        stream.on('end', () => {
          files.set(name, Buffer.concat(chunks));
          zip.readEntry();
        });
        stream.on('error', reject);
      });
    });
    zip.on('end', resolve);
    zip.on('error', reject);
    zip.readEntry();
  });
  // Packages zipped inside a folder: strip the common top folder.
  const names = [...files.keys()];
  const top = names.every((n) => n.includes('/')) ? names[0]!.split('/')[0] + '/' : '';
  if (top && names.every((n) => n.startsWith(top)) && !files.has('datapackage.json')) {
    return new Map([...files.entries()].map(([n, b]) => [n.slice(top.length), b]));
  }
  return files;
}
