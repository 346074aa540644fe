import { z } from 'zod';

/** Per-file verdicts of a card upload request. */
export type FileVerdict = 'accepted' | 'duplicate' | 'rejected';

/** Codes of rejected files: each has a sentence a volunteer understands. */
export type RejectCode =
  | 'empty_file'
  | 'not_an_image'
  | 'unsupported_format'
  | 'truncated'
  | 'too_many_pixels'
  | 'file_too_large'
  | 'too_many_files'
  | 'request_too_large'
  | 'bad_file_name'
  | 'unreadable';

/** One file's outcome in `POST .../uploads`. */
export interface FileResult {
  name: string;
  status: FileVerdict;
  photoId?: string;
  code?: RejectCode;
  message?: string;
}

/** Answer of `POST /api/projects/:slug/deployments/:deploymentId/uploads`. */
export interface UploadResponse {
  upload: { id: string };
  files: FileResult[];
}

/** Processing states of a photo. */
/** `external`: imported from a package without the file, only its record is kept. */
export type PhotoStatus = 'queued' | 'processing' | 'ready' | 'failed' | 'purged' | 'external';

/** Flags a photo can carry after ingest. */
export const PHOTO_FLAGS = [
  'no_exif_time',
  'exif_unreadable',
  'outside_deployment',
  'gps_far_from_station',
  'serial_mismatch',
  'clock_reset_suspected',
] as const;
export type PhotoFlag = (typeof PHOTO_FLAGS)[number];

/** What each flag means, for summaries and filters. */
export const FLAG_TEXT: Record<PhotoFlag, string> = {
  no_exif_time: 'No capture time in the file',
  exif_unreadable: 'The file’s metadata could not be read',
  outside_deployment: 'Taken outside the deployment’s dates (after the clock fix)',
  gps_far_from_station: 'Camera GPS far from the station',
  serial_mismatch: 'Camera serial differs from the deployment’s',
  clock_reset_suspected: 'Camera clock looks reset (date before 2010)',
};

/** Answer of `GET /api/projects/:slug/uploads/:uploadId`. */
export interface UploadProgress {
  id: string;
  deploymentId: string;
  stationCode: string;
  cameraLabel: string;
  uploaderName: string;
  createdAt: string;
  counts: {
    accepted: number;
    duplicate: number;
    rejected: number;
    queued: number;
    processing: number;
    ready: number;
    failed: number;
  };
  flagged: Partial<Record<PhotoFlag, number>>;
  done: boolean;
}

/** One line of the upload list. */
export interface UploadListItem extends UploadProgress {
  files: number;
}

/** A file's verdict as kept for the upload summary. */
export interface UploadFileView {
  name: string;
  status: FileVerdict;
  code: RejectCode | null;
  message: string | null;
  photoId: string | null;
}

/** A photo in `GET /api/projects/:slug/photos`. */
export interface PhotoView {
  id: string;
  originalName: string;
  sha256: string;
  takenAtExif: string | null;
  takenAt: string | null;
  lat: number | null;
  lon: number | null;
  width: number;
  height: number;
  status: PhotoStatus;
  flags: PhotoFlag[];
  deploymentId: string;
  uploadId: string;
  eventId: string | null;
  error: string | null;
  thumbUrl: string;
}

/** Query of `GET /api/projects/:slug/photos`. */
export const photoListQuerySchema = z
  .object({
    uploadId: z
      .string()
      .regex(/^[0-9a-f]{20}$/, { message: 'uploadId is not a valid id.' })
      .optional(),
    deploymentId: z
      .string()
      .regex(/^[0-9a-f]{20}$/, { message: 'deploymentId is not a valid id.' })
      .optional(),
    status: z.enum(['queued', 'processing', 'ready', 'failed']).optional(),
    flag: z.enum(PHOTO_FLAGS).optional(),
    after: z.string().max(200).optional(),
    limit: z.coerce.number().int().min(1).max(5000).default(1000),
  })
  .strict();
