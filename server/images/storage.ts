import { randomBytes } from 'node:crypto';
import { mkdir, readdir, rename, rm, stat, unlink, writeFile } from 'node:fs/promises';
import { dirname, join, relative } from 'node:path';

/** Where photo bytes live: content-addressed originals, derivatives per hash, and a temp area. */
export class PhotoStorage {
  readonly tmpDir: string;
  readonly originalsDir: string;
  readonly derivedDir: string;

  constructor(readonly root: string) {
    this.tmpDir = join(root, 'tmp');
    this.originalsDir = join(root, 'originals');
    this.derivedDir = join(root, 'derived');
  }

  /** Creates the folders. */
  async init(): Promise<void> {
    await Promise.all(
      [this.tmpDir, this.originalsDir, this.derivedDir].map((d) => mkdir(d, { recursive: true })),
    );
  }

  /** A fresh path in the temp area. */
  tmpPath(): string {
    return join(this.tmpDir, `${Date.now()}-${randomBytes(8).toString('hex')}.part`);
  }

  /** Relative path of an original (stored once per SHA-256). */
  originalRelative(sha256: string): string {
    return join('originals', sha256.slice(0, 2), `${sha256}.jpg`);
  }

  /** Absolute path from a relative stored path. */
  absolute(relativePath: string): string {
    return join(this.root, relativePath);
  }

  /** Derivative file of a photo's bytes: 'thumb', 'preview' or 'exif-thumb'. */
  derivedPath(sha256: string, kind: 'thumb' | 'preview' | 'exif-thumb'): string {
    return join(this.derivedDir, sha256.slice(0, 2), sha256, `${kind}.jpg`);
  }

  /** Moves a finished temp file to its content address; if those bytes are already stored, drops it. */
  async adoptOriginal(tmpPath: string, sha256: string): Promise<string> {
    const rel = this.originalRelative(sha256);
    const target = this.absolute(rel);
    await mkdir(dirname(target), { recursive: true });
    const exists = await stat(target).then(
      () => true,
      () => false,
    );
    if (exists) await unlink(tmpPath);
    else await rename(tmpPath, target);
    return rel;
  }

  /** Writes a file so that readers never see it half-written (temp file, then rename). */
  async writeAtomic(path: string, bytes: Buffer): Promise<void> {
    await mkdir(dirname(path), { recursive: true });
    const tmp = `${path}.${randomBytes(6).toString('hex')}.part`;
    await writeFile(tmp, bytes);
    await rename(tmp, path);
  }

  /** Removes a temp file if it is still there. */
  async discard(path: string): Promise<void> {
    await rm(path, { force: true });
  }

  /**
   * After a crash: empties the temp area and removes originals and derivatives that no photo row
   * refers to, so no file is left without a row. `referenced` holds the SHA-256 of every stored photo.
   */
  async recover(referenced: Set<string>): Promise<{ tmp: number; orphans: number }> {
    let tmp = 0;
    let orphans = 0;
    for (const name of await readdir(this.tmpDir).catch(() => [] as string[])) {
      await rm(join(this.tmpDir, name), { force: true, recursive: true });
      tmp++;
    }
    for (const prefix of await readdir(this.originalsDir).catch(() => [] as string[])) {
      const dir = join(this.originalsDir, prefix);
      for (const name of await readdir(dir).catch(() => [] as string[])) {
        const sha = name.replace(/\.jpg$/, '');
        if (name.endsWith('.part') || !referenced.has(sha)) {
          await rm(join(dir, name), { force: true });
          await rm(join(this.derivedDir, prefix, sha), { force: true, recursive: true });
          orphans++;
        }
      }
    }
    for (const prefix of await readdir(this.derivedDir).catch(() => [] as string[])) {
      for (const sha of await readdir(join(this.derivedDir, prefix)).catch(() => [] as string[])) {
        if (!referenced.has(sha)) {
          await rm(join(this.derivedDir, prefix, sha), { force: true, recursive: true });
          orphans++;
        }
      }
    }
    return { tmp, orphans };
  }

  /** For logs: a path relative to the storage root. */
  describe(path: string): string {
    return relative(this.root, path);
  }
}
