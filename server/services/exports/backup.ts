import type SQLite from 'better-sqlite3';
import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import type { Response } from 'express';
import { sql } from 'kysely';
import yazl from 'yazl';
import type { Db } from '../../db/database';
import type { PhotoStorage } from '../../images/storage';

function walk(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) walk(path, out);
    else if (!name.endsWith('.part')) out.push(path);
  }
  return out;
}

/**
 * A consistent backup while the app runs: a snapshot of the database, then the photo store
 * (originals and derivatives; the temp area is left out). Photos stored after the snapshot are
 * harmless extras: the snapshot does not refer to them.
 */
export async function streamBackup(
  db: Db,
  sqlite: SQLite.Database | undefined,
  storage: PhotoStorage,
  res: Response,
): Promise<void> {
  const dir = mkdtempSync(join(tmpdir(), 'maculo-backup-'));
  const snapshot = join(dir, 'maculo.sqlite');
  try {
    // SQLite's online backup API copies a consistent snapshot page by page while readers and
    // writers carry on; without the raw handle VACUUM INTO gives the same consistency.
    if (sqlite) await sqlite.backup(snapshot);
    else await sql`vacuum into ${snapshot}`.execute(db);
    const zip = new yazl.ZipFile();
    zip.addFile(snapshot, 'maculo.sqlite');
    for (const folder of [storage.originalsDir, storage.derivedDir]) {
      for (const file of walk(folder)) zip.addFile(file, `uploads/${relative(storage.root, file)}`);
    }
    zip.addBuffer(
      Buffer.from(
        'Maculo backup: maculo.sqlite is the database; uploads/ is the photo store. See README.md, "Backup and restore".\n',
      ),
      'README.txt',
    );
    zip.end();
    const stamp = new Date().toISOString().slice(0, 16).replace(/[:T]/g, '-');
    res.set({
      'Content-Type': 'application/zip',
      'Content-Disposition': `attachment; filename="maculo-backup-${stamp}.zip"`,
    });
    await new Promise<void>((resolve, reject) => {
      zip.outputStream.on('error', reject).pipe(res).on('finish', resolve).on('error', reject);
    });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
