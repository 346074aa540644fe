import { createHash } from 'node:crypto';
import { createWriteStream } from 'node:fs';
import { pipeline } from 'node:stream/promises';
import { Transform } from 'node:stream';
import type { Request, RequestHandler } from 'express';
import multer, { type StorageEngine } from 'multer';
import type { RejectCode } from '../../shared/ingest';
import { ApiError } from '../errors/api-error';
import type { PhotoStorage } from '../images/storage';

/** Limits of one upload request. */
export interface UploadLimits {
  maxFileBytes: number;
  maxFilesPerRequest: number;
  maxRequestBytes: number;
}

/** A file as the storage engine leaves it: on disk with its hash, or refused with a reason. */
export interface ReceivedFile {
  rawName: string;
  tmpPath: string | null;
  size: number;
  sha256: string | null;
  refused: { code: RejectCode; message: string } | null;
}

interface RequestTally {
  files: number;
  bytes: number;
  received: ReceivedFile[];
}

const TALLY = Symbol('uploadTally');

function tallyOf(req: Request): RequestTally {
  const holder = req as Request & { [TALLY]?: RequestTally };
  holder[TALLY] ??= { files: 0, bytes: 0, received: [] };
  return holder[TALLY];
}

/** Files received by this request, in order. */
export function receivedFiles(req: Request): ReceivedFile[] {
  return tallyOf(req).received;
}

/**
 * A multer storage engine that hashes while it writes to the temp area, and refuses a file (one
 * verdict, the rest of the card goes on) rather than failing the whole request when a limit is hit.
 */
export function cardStorage(storage: PhotoStorage, limits: UploadLimits): StorageEngine {
  return {
    _handleFile(req, file, cb) {
      const tally = tallyOf(req);
      tally.files++;
      const entry: ReceivedFile = {
        rawName: file.originalname,
        tmpPath: null,
        size: 0,
        sha256: null,
        refused: null,
      };
      tally.received.push(entry);
      const refuse = (code: RejectCode, message: string) => {
        entry.refused = { code, message };
        file.stream.resume();
        file.stream.on('end', () => cb(null, { size: 0 }));
        file.stream.on('error', cb);
      };
      if (tally.files > limits.maxFilesPerRequest) {
        refuse(
          'too_many_files',
          `Only ${limits.maxFilesPerRequest} files are taken per request; send the rest again.`,
        );
        return;
      }
      const path = storage.tmpPath();
      entry.tmpPath = path;
      const hash = createHash('sha256');
      let size = 0;
      let over: RejectCode | null = null;
      const meter = new Transform({
        transform(chunk: Buffer, _enc, done) {
          size += chunk.length;
          tally.bytes += chunk.length;
          if (!over && size > limits.maxFileBytes) over = 'file_too_large';
          if (!over && tally.bytes > limits.maxRequestBytes) over = 'request_too_large';
          if (over) return done();
          hash.update(chunk);
          done(null, chunk);
        },
      });
      pipeline(file.stream, meter, createWriteStream(path))
        .then(async () => {
          entry.size = size;
          if (over) {
            await storage.discard(path);
            entry.tmpPath = null;
            entry.refused =
              over === 'file_too_large'
                ? {
                    code: over,
                    message: `The file is larger than ${Math.round(limits.maxFileBytes / 1e6)} MB.`,
                  }
                : {
                    code: over,
                    message: 'This request carried more bytes than allowed; send the rest again.',
                  };
          } else {
            entry.sha256 = hash.digest('hex');
          }
          cb(null, { size, path });
        })
        .catch(async (err: unknown) => {
          await storage.discard(path);
          entry.tmpPath = null;
          cb(err instanceof Error ? err : new Error(String(err)));
        });
    },
    _removeFile(_req, file, cb) {
      const path = (file as { path?: string }).path;
      if (!path) return cb(null);
      storage.discard(path).then(() => cb(null), cb);
    },
  };
}

/** The multer middleware for card uploads: field `photos`, many files. */
export function cardUploadMiddleware(storage: PhotoStorage, limits: UploadLimits): RequestHandler {
  const parse = multer({
    storage: cardStorage(storage, limits),
    // Keep the full name the browser sent so names with paths are refused, not silently shortened.
    preservePath: true,
    limits: { files: 100_000, fields: 20, fieldSize: 4096, parts: 100_100, headerPairs: 200 },
  }).array('photos');
  // A request the multipart parser cannot read at all is the client's fault: answer 400, keep nothing.
  return (req, res, next) =>
    parse(req, res, (err?: unknown) => {
      if (!err) return next();
      const detail = err instanceof Error ? err.message : String(err);
      next(
        new ApiError(
          'bad_request',
          err instanceof multer.MulterError && err.code === 'LIMIT_UNEXPECTED_FILE'
            ? `Send photos in the form field "photos" (got "${err.field ?? ''}").`
            : `The upload could not be read (${detail}). Nothing from this request was kept; send it again.`,
        ),
      );
    });
}
