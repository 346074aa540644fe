/**
 * Public types of the synthetic trail-camera photo generator.
 *
 * Flank convention: a flank is the animal's own side. In an un-mirrored photo the LEFT flank is
 * seen with the head pointing to image LEFT, the RIGHT flank with the head pointing to image RIGHT
 * (an animal walking to the viewer's right shows its right side). `mirror` flips the finished photo,
 * so a mirrored left-flank photo has the head pointing right; the truth keeps the real flank and
 * reports the head direction as it appears in the image.
 */
import type { Flank, Individual, Traits } from './coat';

export type { Flank, Individual, Traits };

/** Daylight colour, or the grey, flat look of an infrared night photo. */
export type Lighting = 'day' | 'infrared';

/** Non-target species the generator can paint. */
export type OtherSpecies = 'bushbuck' | 'porcupine' | 'honeyBadger' | 'baboon' | 'genet';

/** What the photo shows. */
export type Subject =
  | { readonly kind: 'target'; readonly individual: Individual | string; readonly flank: Flank }
  | { readonly kind: 'animal'; readonly species: OtherSpecies }
  | { readonly kind: 'human' }
  | { readonly kind: 'vehicle' }
  | { readonly kind: 'blank' }
  /** The board photographed at camera set-up, with lines such as station, date and true time. */
  | { readonly kind: 'setup'; readonly lines: readonly string[] };

/** Kinds of subject, as reported in the truth. */
export type SubjectKind = Subject['kind'];

/** How the subject is posed and photographed. Every field has a neutral default. */
export interface Variation {
  /** Distance from the camera in metres (default: on the trail, about 3–5 m). */
  readonly distanceM: number;
  /** Horizontal position of the subject's middle, −1 (left edge) … 1 (right edge); default 0. */
  readonly position: number;
  /** Turn of the body towards (+) or away from (−) the camera, degrees; 0 = side-on. */
  readonly yawDeg: number;
  /** In-plane tilt (walking up or down a slope), degrees. */
  readonly rollDeg: number;
  /** Walking phase 0–1 (leg positions). */
  readonly gait: number;
  /** Motion blur length as a fraction of the body length (0 = sharp; 0.05 is strong). */
  readonly motionBlur: number;
  /** Fraction of the subject to hide behind foreground vegetation, 0–0.3. */
  readonly occlusion: number;
  /** Flip the whole finished photo left to right. */
  readonly mirror: boolean;
  /** Exposure multiplier (1 = normal). */
  readonly exposure: number;
  /** Wind: how far grass and leaves sway, 0–1. */
  readonly wind: number;
}

/** EXIF fields written into the JPEG (camera local time, no zone). */
export interface ExifFields {
  /** "YYYY:MM:DD HH:MM:SS" as the camera's clock showed it. */
  readonly dateTimeOriginal: string;
  /** Fraction of a second as digits, e.g. "042". */
  readonly subSecTimeOriginal?: string;
  readonly make?: string;
  readonly model?: string;
  /** Camera body serial number. */
  readonly serial?: string;
  readonly gps?: { readonly lat: number; readonly lon: number; readonly altitudeM?: number };
  /** Embed a ~160 px thumbnail in IFD1 (default true). */
  readonly thumbnail?: boolean;
}

/** Everything that determines one photo; the same spec always gives the same bytes. */
export interface PhotoSpec {
  readonly width: number;
  readonly height: number;
  /** Per-photo randomness (wind, grain, exact light). */
  readonly seed: number;
  /** Station and camera: each camera's photos share one background. */
  readonly station: string | number;
  readonly camera: string;
  readonly lighting: Lighting;
  readonly subject: Subject;
  readonly variation?: Partial<Variation>;
  /** Omit to write a JPEG without EXIF (some cards hold such files). */
  readonly exif?: ExifFields;
  /** JPEG quality 1–100 (default 85). */
  readonly quality?: number;
  /** Text at the left of the data band (default: station and camera). False: no band. */
  readonly band?: string | false;
  /**
   * Draw scenery nearer than variation.distanceM (default true); false gives clean reference
   * views, and a blank with the same distance shows exactly the scenery behind such a subject.
   */
  readonly foreground?: boolean;
  /** Air temperature shown in the band, °C (default drawn from the seed). */
  readonly temperatureC?: number;
}

/** Pixel box, x/y of the top-left pixel, inclusive size. */
export interface PixelBox {
  readonly x: number;
  readonly y: number;
  readonly width: number;
  readonly height: number;
}

/** Ground truth returned with every photo. */
export interface PhotoTruth {
  readonly kind: SubjectKind;
  /** Camtrap DP observationType for the photo. */
  readonly observationType: 'animal' | 'human' | 'vehicle' | 'blank' | 'unclassified';
  /** Scientific name for animals, else null. */
  readonly species: string | null;
  readonly commonName: string | null;
  readonly individualId: string | null;
  readonly flank: Flank | null;
  /** Where the head points in the finished (possibly mirrored) photo. */
  readonly headDirection: 'left' | 'right' | null;
  /** Box of the subject (coverage ≥ 25 %), clipped to the scene above the data band. */
  readonly bbox: PixelBox | null;
  /** Fraction of the subject's pixels hidden by the foreground occluder (measured). */
  readonly occludedFraction: number;
  /**
   * For the target: 3×3 row-major homography from body coordinates (units of body length,
   * x towards the head, y up, paws at y = 0) to pixel centres of the finished photo.
   */
  readonly bodyToImage: readonly number[] | null;
  readonly lighting: Lighting;
  readonly variation: Variation;
  readonly width: number;
  readonly height: number;
  readonly seed: number;
  readonly station: string;
  readonly camera: string;
  readonly exif: ExifFields | null;
  /** Height of the data band at the bottom, pixels (0 without band). */
  readonly bandHeight: number;
}
