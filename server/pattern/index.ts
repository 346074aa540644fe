/** The coat-pattern similarity engine: what the rest of the server imports. */
export { PatternCatalogue } from './catalogue';
export type { CatalogueEntry, ShortlistEntry, ShortlistOptions } from './catalogue';
export { extractFeatures } from './features';
export { createPatternPool, PatternError, shortlistFor } from './pool';
export type { CatalogueSource, PatternPool } from './pool';
export { rankCandidates, scoreOfInliers } from './rank';
export { deserializeFeatures, referenceOnly, serializeFeatures } from './serialize';
export { PATTERN_PARAMS } from './types';
export type {
  CropBox,
  FeatureSet,
  FeatureView,
  MatchedPair,
  RankedCandidate,
  ReferenceFeatures,
  RgbaPixels,
} from './types';
