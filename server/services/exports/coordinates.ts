import { PUBLIC_PRECISION, type SensitivityCategory } from '../../../shared/projects';
import { snapToGrid } from '../geo';

/** How coordinates leave the project in an export. */
export interface CoordinatePolicy {
  /** Grid in degrees (null: exact). */
  precision: number | null;
  /** The category says withhold; the standard needs a position, so only the 1° region is given. */
  withheld: boolean;
  category: SensitivityCategory;
  reviewDate: string | null;
}

// GPS error and how far a camera sees (typically within 30 m): the floor of every uncertainty.
const GPS_M = 30;
const DETECTION_M = 30;
const METRES_PER_DEGREE = 111_320;

/**
 * The coordinate policy of an export: a private export keeps exact positions; a public one
 * snaps them to the project's public grid (GBIF: never add random noise), and for the extreme
 * category gives only the 1° region.
 */
export function exportPolicy(
  project: { sensitivity: string; sensitivity_review_date: string | null },
  profile: 'public' | 'private',
): CoordinatePolicy {
  const category = project.sensitivity as SensitivityCategory;
  const precision = PUBLIC_PRECISION[category];
  if (profile === 'private' || precision === undefined)
    return {
      precision: null,
      withheld: false,
      category,
      reviewDate: project.sensitivity_review_date,
    };
  if (precision === null)
    return { precision: 1, withheld: true, category, reviewDate: project.sensitivity_review_date };
  return { precision, withheld: false, category, reviewDate: project.sensitivity_review_date };
}

/** A position under the policy, with its uncertainty in metres (rounding + GPS + detection distance). */
export function placeUnder(
  policy: CoordinatePolicy,
  lat: number,
  lon: number,
): { lat: number; lon: number; uncertainty: number } {
  if (policy.precision === null) return { lat, lon, uncertainty: GPS_M + DETECTION_M };
  const rounding = policy.precision * METRES_PER_DEGREE * Math.SQRT1_2;
  return {
    lat: snapToGrid(lat, policy.precision),
    lon: snapToGrid(lon, policy.precision),
    uncertainty: Math.ceil(GPS_M + DETECTION_M + rounding),
  };
}

/** The Darwin Core dataGeneralizations sentence, with the date the sensitivity is reviewed again. */
export function generalizationText(policy: CoordinatePolicy): string {
  if (policy.precision === null) return '';
  const review = policy.reviewDate ? `; sensitivity to be reviewed by ${policy.reviewDate}` : '';
  if (policy.withheld)
    return `coordinates withheld (sensitivity category ${policy.category}); only the 1 degree region is given${review}`;
  return `coordinates rounded to ${policy.precision} degrees (sensitivity category ${policy.category})${review}`;
}
