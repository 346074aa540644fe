/** Coat-pattern features of one photo inside one crop (see server/pattern/serialize.ts). */
export interface PatternFeaturesTable {
  photo_id: string;
  /** The crop as a sighting stores it (JSON of fractions of the photo); '' for the whole photo. */
  crop: string;
  /** Vocabulary the visual words refer to; rows with another vocabulary are computed again. */
  vocabulary: string;
  /** Keypoints of the plain view (0 when the crop showed no texture). */
  keypoints: number;
  features: Buffer;
  computed_at: string;
}
