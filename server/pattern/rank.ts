/**
 * Ranking in three steps: the spatial-word shortlist (catalogue.ts), a cheap JavaScript
 * pre-verification of every shortlisted pair (prematch.ts), then full verification with OpenCV
 * (verify.ts) of the best pair of the leading individuals. The score is
 * inliers / (inliers + PATTERN_PARAMS.scoreHalfInliers): 0 without verified geometry, 0.5 at 20
 * inliers, approaching 1 for many.
 */
import {
  type CatalogueEntry,
  PatternCatalogue,
  type ShortlistEntry,
  type ShortlistOptions,
} from './catalogue';
import { type Cv, cvError, loadOpenCv } from './opencv';
import { prematchInliers } from './prematch';
import { sceneryTest } from './scenery';
import {
  PATTERN_PARAMS,
  type FeatureSet,
  type MatchedPair,
  type RankedCandidate,
  type ReferenceFeatures,
} from './types';
import { Verifier } from './verify';

/** A shortlisted reference with its features, ready for verification. */
export interface ShortlistedReference extends ShortlistEntry {
  readonly features: FeatureSet;
}

/** A shortlisted pair after the pre-verification. */
export interface Prematched {
  readonly ref: ShortlistedReference;
  readonly prematchInliers: number;
}

/** Normalised pattern score of a number of verified inliers. */
export function scoreOfInliers(inliers: number): number {
  return inliers <= 0 ? 0 : inliers / (inliers + PATTERN_PARAMS.scoreHalfInliers);
}

/** Pre-verifies every shortlisted pair and keeps each individual's best, best first. */
export function prematchShortlist(
  query: FeatureSet,
  shortlisted: readonly ShortlistedReference[],
  individuals = PATTERN_PARAMS.verifyIndividuals,
): Prematched[] {
  const best = new Map<string, Prematched>();
  shortlisted.forEach((ref, i) => {
    const view = ref.mirrored ? query.mirrored : query.plain;
    if (!view) return;
    const f = ref.features;
    const inliers = prematchInliers(
      { view, aspect: query.width / query.height },
      { view: f.plain, aspect: f.width / f.height },
      i + 1,
      sceneryTest(query, ref.mirrored, f),
    );
    const seen = best.get(ref.individualId);
    if (!seen || inliers > seen.prematchInliers)
      best.set(ref.individualId, { ref, prematchInliers: inliers });
  });
  return [...best.values()]
    .sort((a, b) => b.prematchInliers - a.prematchInliers || b.ref.votes - a.ref.votes)
    .slice(0, individuals);
}

function unflipQuery(pairs: readonly MatchedPair[]): MatchedPair[] {
  // Mirrored-view points live in the flipped image; drawing needs the photo as stored.
  return pairs.map(([qx, qy, rx, ry]) => [1 - qx, qy, rx, ry]);
}

/** Full verification (OpenCV loaded) of pre-verified pairs: one candidate per pair, best first. */
export function verifyPrematchedWith(
  cv: Cv,
  query: FeatureSet,
  pairs: readonly Prematched[],
): RankedCandidate[] {
  const verifiers = new Map<boolean, Verifier>();
  const out: RankedCandidate[] = [];
  try {
    for (const { ref, prematchInliers: pre } of pairs) {
      const view = ref.mirrored ? query.mirrored : query.plain;
      if (!view) continue;
      let verifier = verifiers.get(ref.mirrored);
      if (!verifier) {
        verifier = new Verifier(cv, { view, width: query.width, height: query.height });
        verifiers.set(ref.mirrored, verifier);
      }
      const f = ref.features;
      const v = verifier.verify(
        { view: f.plain, width: f.width, height: f.height },
        sceneryTest(query, ref.mirrored, f),
      );
      out.push({
        individualId: ref.individualId,
        score: scoreOfInliers(v.inliers),
        inliers: v.inliers,
        photoId: ref.photoId,
        mirrored: ref.mirrored,
        votes: ref.votes,
        prematchInliers: pre,
        matches: ref.mirrored ? unflipQuery(v.pairs) : v.pairs,
      });
    }
  } catch (err) {
    throw cvError(cv, err);
  } finally {
    for (const v of verifiers.values()) v.delete();
  }
  return out.sort(
    (a, b) => b.inliers - a.inliers || b.prematchInliers - a.prematchInliers || b.votes - a.votes,
  );
}

/** Pre-verifies and verifies a shortlist (OpenCV loaded): the ranking, best first. */
export function rankShortlistWith(
  cv: Cv,
  query: FeatureSet,
  shortlisted: readonly ShortlistedReference[],
): RankedCandidate[] {
  return verifyPrematchedWith(cv, query, prematchShortlist(query, shortlisted));
}

/** Builds a catalogue of the references and shortlists them for the query (no OpenCV). */
export function shortlistReferences(
  query: FeatureSet,
  references: readonly ReferenceFeatures[],
  options: ShortlistOptions = {},
): ShortlistedReference[] {
  const catalogue = new PatternCatalogue();
  const byPhoto = new Map<string, ReferenceFeatures>();
  for (const r of references) {
    const entry: CatalogueEntry = {
      individualId: r.individualId,
      photoId: r.photoId,
      flank: r.flank,
    };
    catalogue.add(entry, r.features);
    byPhoto.set(r.photoId, r);
  }
  return attachFeatures(catalogue.shortlist(query, options), (id) => byPhoto.get(id)?.features);
}

/** Joins shortlist entries with their features (entries without features are dropped). */
export function attachFeatures(
  entries: readonly ShortlistEntry[],
  featuresOf: (photoId: string) => FeatureSet | undefined,
): ShortlistedReference[] {
  return entries.flatMap((e) => {
    const features = featuresOf(e.photoId);
    return features ? [{ ...e, features }] : [];
  });
}

/** Ranks catalogue individuals by coat-pattern similarity to the query, best first. */
export async function rankCandidates(
  query: FeatureSet,
  references: readonly ReferenceFeatures[],
  options: ShortlistOptions = {},
): Promise<RankedCandidate[]> {
  const cv = await loadOpenCv();
  return rankShortlistWith(cv, query, shortlistReferences(query, references, options));
}
