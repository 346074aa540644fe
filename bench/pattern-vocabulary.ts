/**
 * Builds the visual vocabulary asset (server/pattern/vocabulary-v1.json) from synthetic training
 * photos of individuals "TRAIN-000…" only; the evaluation and the tests use other individuals.
 * Run: npx tsx bench/pattern-vocabulary.ts [--k 1024] [--individuals 60]
 * Deterministic: the same painter and options give the same file.
 */
import { writeFileSync } from 'node:fs';
import { extractFeatures } from '../server/pattern/features';
import { VOCABULARY_FILE } from '../server/pattern/vocabulary';
import { trainVocabulary } from '../server/pattern/vocabulary-train';
import { QUERY_CONDITIONS, ids, planPhoto, type SetShape } from '../tests/pattern/photo-set';
import { renderCached } from './pattern-cache';

function option(name: string, fallback: number): number {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? Number(process.argv[i + 1]) : fallback;
}

/** Training shape: the same photo size as the benchmark, more stations than any evaluation. */
export const TRAIN_SHAPE: SetShape = { width: 1024, height: 768, stations: 30 };

async function main(): Promise<void> {
  const k = option('k', 1024);
  const n = option('individuals', 60);
  const conditions = ['reference', ...QUERY_CONDITIONS] as const;
  const plans = ids('TRAIN', n).flatMap((id, i) =>
    (['left', 'right'] as const).map((flank, f) =>
      planPhoto(id, flank, conditions[(i * 2 + f) % conditions.length], 100, TRAIN_SHAPE),
    ),
  );
  const docs: Uint8Array[] = [];
  const started = performance.now();
  for (const [i, plan] of plans.entries()) {
    const photo = await renderCached(plan);
    const f = await extractFeatures(photo.pixels, photo.crop, { vocabulary: null });
    docs.push(f.plain.descriptors);
    if (f.mirrored) docs.push(f.mirrored.descriptors);
    if (i % 20 === 19) console.log(`${i + 1}/${plans.length} photos`);
  }
  const total = docs.reduce((s, d) => s + d.length / 32, 0);
  console.log(`${total} descriptors from ${docs.length} views (${plans.length} photos)`);
  const content = trainVocabulary(docs, {
    k,
    iterations: 25,
    seed: 20240611,
    id: `orb-kmaj-${k}-v1`,
    trainedOn: `synthetic photos of ${n} training individuals (TRAIN-000…), both flanks, plain and flipped, ${TRAIN_SHAPE.width}×${TRAIN_SHAPE.height}`,
    onIteration: (it, changed) =>
      console.log(`iteration ${it}: ${(changed * 100).toFixed(2)} % changed`),
  });
  const path = new URL(`../server/pattern/${VOCABULARY_FILE}`, import.meta.url);
  writeFileSync(path, JSON.stringify(content) + '\n');
  console.log(`wrote ${path.pathname} in ${((performance.now() - started) / 1000).toFixed(0)} s`);
}

await main();
