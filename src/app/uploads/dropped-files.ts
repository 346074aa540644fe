/** Minimal shapes of the File and Directory Entries API (not in TypeScript's DOM types everywhere). */
interface EntryLike {
  isFile: boolean;
  isDirectory: boolean;
  name: string;
  file?(success: (file: File) => void, failure: (err: unknown) => void): void;
  createReader?(): {
    readEntries(success: (entries: EntryLike[]) => void, failure: (err: unknown) => void): void;
  };
}

async function readEntry(entry: EntryLike, out: File[]): Promise<void> {
  if (entry.isFile && entry.file) {
    out.push(await new Promise<File>((resolve, reject) => entry.file!(resolve, reject)));
  } else if (entry.isDirectory && entry.createReader) {
    const reader = entry.createReader();
    // readEntries returns at most ~100 entries per call: keep reading until it returns none.
    for (;;) {
      const batch = await new Promise<EntryLike[]>((resolve, reject) =>
        reader.readEntries(resolve, reject),
      );
      if (batch.length === 0) break;
      for (const child of batch) await readEntry(child, out);
    }
  }
}

/** Every file of a drop, walking into dropped folders (a whole card's DCIM folder works). */
export async function filesFromDrop(data: DataTransfer): Promise<File[]> {
  const entries: EntryLike[] = [];
  for (const item of Array.from(data.items ?? [])) {
    const entry = (
      item as DataTransferItem & { webkitGetAsEntry?(): EntryLike | null }
    ).webkitGetAsEntry?.();
    if (entry) entries.push(entry);
  }
  if (entries.length === 0) return Array.from(data.files ?? []);
  const out: File[] = [];
  for (const entry of entries) await readEntry(entry, out);
  return out;
}

/** Hidden and system files a camera card carries that are never photos. */
export function isCardClutter(name: string): boolean {
  return name.startsWith('.') || /^(thumbs\.db|desktop\.ini)$/i.test(name);
}
