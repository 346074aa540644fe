/** Figures, targets and the printed table of the ingest benchmark. */
import type { PipelineTiming, StageProfile } from './ingest-baseline';
import type { ProcessingDone, SortableCheck, UploadRun } from './ingest-upload';
import { describeLoad, percentile, printTable, round, type MachineLoad } from './report';

/** Everything one run measured. */
export interface IngestResult {
  benchmark: 'ingest';
  at: string;
  commit: string;
  photos: number;
  photoSize: string;
  meanMbPerPhoto: number;
  batchSize: number;
  workers: number;
  upload: UploadRun;
  sortable: SortableCheck;
  processed: ProcessingDone;
  processedSeconds: number;
  peaks: { peakRssMb: number; vmHwmMb: number };
  timeline: { t: number; rssMb: number }[];
  /** What the rest of the machine did during the server phase. */
  machine: MachineLoad;
  stockJimp: Measured<PipelineTiming>;
  pipeline: Measured<PipelineTiming>;
  stages: StageProfile;
}

/** A phase's figures with the machine load during it. */
export type Measured<T> = T & { machine: MachineLoad };

const TARGET_SORTABLE_S_PER_PHOTO = 0.2;
const TARGET_RATIO = 3;
const TARGET_PEAK_MB = 1536;
const CARD_PHOTOS = 2000;

function verdict(ok: boolean): string {
  return ok ? 'met' : 'MISSED';
}

/** Photos per core-second of our own processes (warm-up photos included, one per thread). */
function perCoreSecond(p: Measured<PipelineTiming>): number {
  return (p.photos + p.threads) / p.machine.ownCpuSeconds;
}

function pipelineRow(p: Measured<PipelineTiming>) {
  return {
    machine: p.machine,
    photos: p.photos,
    threads: p.threads,
    seconds: round(p.seconds, 2),
    photosPerSecond: round(p.photosPerSecond, 2),
    medianMsPerPhoto: round(p.medianMsPerPhoto, 0),
  };
}

/** Prints the table and returns the JSON record of the run. */
export function printIngestReport(r: IngestResult): object {
  const sortableS = r.upload.ms / 1000;
  const perPhoto = sortableS / r.photos;
  const batchMs = r.upload.batches.map((b) => b.ms / b.files);
  const processedRate = r.photos / r.processedSeconds;
  const ratio = processedRate / r.stockJimp.photosPerSecond;
  const pipelineRatio = r.pipeline.photosPerSecond / r.stockJimp.photosPerSecond;
  // CPU-time basis: photos per core-second our processes used; moves less with the machine's other load.
  const processedPerCore = r.photos / r.machine.ownCpuSeconds;
  const cpuRatio = processedPerCore / perCoreSecond(r.stockJimp);
  const accepted = r.upload.batches.reduce((s, b) => s + b.accepted, 0);
  const allSortable =
    r.sortable.photos === r.photos &&
    r.sortable.withCaptureTime === r.photos &&
    r.sortable.inEvents === r.photos &&
    r.sortable.thumbsServed === r.photos;
  const peakMb = Math.max(r.peaks.peakRssMb, r.peaks.vmHwmMb);
  const fullCard = r.photos >= CARD_PHOTOS;

  console.log(
    `\nIngest: ${r.photos} photos ${r.photoSize} (synthetic, mean ${r.meanMbPerPhoto.toFixed(2)} MB), ` +
      `batches of ${r.batchSize}, ${r.workers} image workers; ${accepted} accepted`,
  );
  printTable(
    ['measure', 'value', 'target', 'verdict'],
    [
      [
        '(a) every photo sortable (stored, EXIF, thumbnail, event)',
        `${sortableS.toFixed(1)} s = ${perPhoto.toFixed(3)} s/photo`,
        `< ${TARGET_SORTABLE_S_PER_PHOTO} s/photo`,
        verdict(perPhoto < TARGET_SORTABLE_S_PER_PHOTO && allSortable),
      ],
      [
        '    per batch, per photo (p50 / max)',
        `${(percentile(batchMs, 50) / 1000).toFixed(3)} / ${(Math.max(...batchMs) / 1000).toFixed(3)} s`,
        '',
        '',
      ],
      [
        '    checked through the API right after',
        `${r.sortable.inEvents}/${r.photos} in events, ${r.sortable.thumbsServed} thumbs (${r.sortable.exifThumbs} EXIF)`,
        'all',
        verdict(allSortable),
      ],
      [
        '(b) every preview and thumbnail made',
        `${r.processedSeconds.toFixed(1)} s = ${processedRate.toFixed(2)} photos/s`,
        '',
        '',
      ],
      [
        `(c) stock Jimp baseline (${r.stockJimp.photos} of the files, ${r.stockJimp.threads} threads)`,
        `${r.stockJimp.photosPerSecond.toFixed(2)} photos/s`,
        '',
        '',
      ],
      [
        '    ratio (b)/(c)',
        `${ratio.toFixed(2)}×`,
        `≥ ${TARGET_RATIO}×`,
        verdict(ratio >= TARGET_RATIO),
      ],
      [
        '    same on a CPU-time basis (photos per core-second)',
        `${processedPerCore.toFixed(2)} / ${perCoreSecond(r.stockJimp).toFixed(2)} = ${cpuRatio.toFixed(2)}×`,
        `≥ ${TARGET_RATIO}×`,
        verdict(cpuRatio >= TARGET_RATIO),
      ],
      [
        '    server pipeline alone, same files (no HTTP)',
        `${r.pipeline.photosPerSecond.toFixed(2)} photos/s = ${pipelineRatio.toFixed(2)}× Jimp`,
        '',
        '',
      ],
      [
        '(d) peak RSS, server + workers',
        `${peakMb.toFixed(0)} MB`,
        `< ${TARGET_PEAK_MB} MB (${CARD_PHOTOS}-photo card)`,
        fullCard
          ? verdict(peakMb < TARGET_PEAK_MB)
          : `indicative (${r.photos} photos; --card for the target)`,
      ],
    ],
  );
  console.log(`during (a)+(b): ${describeLoad(r.machine)}`);
  console.log(`during (c):     ${describeLoad(r.stockJimp.machine)}`);
  console.log(`during server pipeline alone: ${describeLoad(r.pipeline.machine)}`);
  console.log(
    `per photo in a worker (median): server ${r.pipeline.medianMsPerPhoto.toFixed(0)} ms, ` +
      `stock Jimp ${r.stockJimp.medianMsPerPhoto.toFixed(0)} ms; server steps in one thread ` +
      `(median of ${r.stages.photos}): decode ${r.stages.decode.toFixed(0)}, 1600 px ` +
      `${r.stages.resizePreview.toFixed(0)}, 320 px ${r.stages.resizeThumb.toFixed(0)}, encode ` +
      `${r.stages.encodePreview.toFixed(0)} + ${r.stages.encodeThumb.toFixed(0)} ms`,
  );

  return {
    benchmark: r.benchmark,
    at: r.at,
    commit: r.commit,
    photos: r.photos,
    photoSize: r.photoSize,
    meanMbPerPhoto: round(r.meanMbPerPhoto, 2),
    batchSize: r.batchSize,
    workers: r.workers,
    sortable: {
      seconds: round(sortableS, 2),
      secondsPerPhoto: round(perPhoto, 4),
      batchSecondsPerPhotoP50: round(percentile(batchMs, 50) / 1000, 4),
      batchSecondsPerPhotoMax: round(Math.max(...batchMs) / 1000, 4),
      check: { ...r.sortable, ms: round(r.sortable.ms, 0) },
      target: `< ${TARGET_SORTABLE_S_PER_PHOTO} s per photo`,
      met: perPhoto < TARGET_SORTABLE_S_PER_PHOTO && allSortable,
    },
    processed: {
      seconds: round(r.processedSeconds, 2),
      photosPerSecond: round(processedRate, 3),
      counts: r.processed.counts,
    },
    stockJimp: pipelineRow(r.stockJimp),
    serverPipeline: pipelineRow(r.pipeline),
    ratio: {
      processedOverStockJimp: round(ratio, 2),
      onCpuTime: round(cpuRatio, 2),
      photosPerCoreSecond: {
        processed: round(processedPerCore, 3),
        stockJimp: round(perCoreSecond(r.stockJimp), 3),
        serverPipeline: round(perCoreSecond(r.pipeline), 3),
      },
      target: TARGET_RATIO,
      met: ratio >= TARGET_RATIO,
    },
    pipelineOverStockJimp: round(pipelineRatio, 2),
    serverStepsMedianMs: Object.fromEntries(
      Object.entries(r.stages).map(([k, v]) => [k, round(v, 1)]),
    ),
    memory: {
      peakRssMb: round(r.peaks.peakRssMb, 0),
      vmHwmMb: round(r.peaks.vmHwmMb, 0),
      target: `< ${TARGET_PEAK_MB} MB for a ${CARD_PHOTOS}-photo card`,
      met: fullCard ? peakMb < TARGET_PEAK_MB : null,
      // [seconds, MB]: about 60 points over the run.
      timeline: r.timeline
        .filter((_, i) => i % Math.max(5, Math.ceil(r.timeline.length / 60)) === 0)
        .map((s) => [s.t, round(s.rssMb, 0)]),
    },
    machine: r.machine,
  };
}
