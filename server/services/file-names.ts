/** A file name from the browser, checked: it is only ever shown, never used as a path. */
export type NameVerdict = { ok: true; name: string } | { ok: false; name: string; message: string };

const decoder = new TextDecoder('utf-8', { fatal: true });

/** Printable form of any name, for the summary of a rejected file. */
function printable(text: string): string {
  // eslint-disable-next-line no-control-regex
  return text.replace(/[\u0000-\u001f\u007f]/g, '�').slice(0, 255);
}

/**
 * Multipart file names arrive as latin1-decoded bytes (busboy's default). They must be valid UTF-8,
 * without path separators, `..`, or control characters, and at most 255 bytes.
 */
export function checkFileName(raw: string): NameVerdict {
  const bytes = Buffer.from(raw, 'latin1');
  let name: string;
  try {
    name = decoder.decode(bytes);
  } catch {
    return {
      ok: false,
      name: printable(bytes.toString('utf8')),
      message: 'The file name is not valid text (not UTF-8); rename the file and upload it again.',
    };
  }
  if (!name.trim()) return { ok: false, name: '(no name)', message: 'The file has no name.' };
  // eslint-disable-next-line no-control-regex
  if (/[\u0000-\u001f\u007f]/.test(name)) {
    return {
      ok: false,
      name: printable(name),
      message: 'The file name contains control characters.',
    };
  }
  if (/[/\\]/.test(name) || name === '.' || name.includes('..')) {
    return {
      ok: false,
      name: printable(name),
      message: 'The file name contains a path (/, \\ or ..); upload the photo itself.',
    };
  }
  if (bytes.length > 255)
    return { ok: false, name: printable(name), message: 'The file name is too long.' };
  return { ok: true, name };
}
