/**
 * Synthetic descriptions of leopards for the Identify benchmark: nicknames, marking notes and trait
 * tags drawn from a small vocabulary of coat and body marks (rosettes, ear notches, scars, tail
 * rings), and the kind of text a reviewer types into the candidate search. All invented.
 */
import type { Rng } from '../seeds/photos/random';

/** What a catalogued animal's description holds. */
export interface SyntheticDescription {
  nickname: string | null;
  sex: 'female' | 'male' | 'unknown';
  notes: string;
  tags: string[];
}

const SIDES = ['left', 'right'] as const;
const PARTS = [
  'shoulder',
  'flank',
  'hip',
  'thigh',
  'neck',
  'cheek',
  'muzzle',
  'forehead',
  'foreleg',
  'hind leg',
  'chest',
  'belly',
] as const;
const ROSETTES = [
  'broken rosette',
  'open rosette',
  'double rosette',
  'fused rosettes',
  'crescent rosette',
  'chain of small rosettes',
  'three-spot triangle',
  'large solid spot',
  'horseshoe rosette',
  'ring of spots',
] as const;
const EAR_MARKS = [
  'notch',
  'V-shaped nick',
  'torn edge',
  'missing tip',
  'two small notches',
] as const;
const SCARS = [
  'healed scar',
  'pale scar',
  'fresh wound',
  'claw marks',
  'bald patch',
  'long scratch',
] as const;
const TAIL_MARKS = [
  'dark tail rings',
  'five complete tail rings',
  'white tail tip',
  'kinked tail',
  'short tail',
  'broken tail ring',
] as const;
const OTHER = [
  'pale left eye',
  'clouded right eye',
  'missing lower canine',
  'limps on right foreleg',
  'heavy dewlap',
  'whisker spots in two rows',
  'very dark coat',
  'pale sandy coat',
  'thin build',
  'collar scar on neck',
] as const;
const SYLLABLES = [
  'ka',
  'li',
  'mo',
  'ra',
  'zu',
  'ne',
  'shi',
  'ta',
  'ko',
  'wa',
  'ma',
  'ni',
  'lo',
  'sa',
  'bu',
  'de',
  'ye',
  'pa',
] as const;
const TYPOS: [RegExp, string][] = [
  [/ss/, 's'],
  [/e/, 'a'],
  [/ch/, 'c'],
  [/tt/, 't'],
  [/ar/, 'ra'],
  [/o/, 'oo'],
  [/ed\b/, 'd'],
  [/s\b/, ''],
];

/** One mark as a trait tag ("notch in left ear", "kinked tail"). */
function mark(rng: Rng): string {
  const side = rng.pick(SIDES);
  switch (rng.int(0, 4)) {
    case 0:
      return `${rng.pick(ROSETTES)} on ${side} ${rng.pick(PARTS)}`;
    case 1:
      return `${rng.pick(EAR_MARKS)} in ${side} ear`;
    case 2:
      return `${rng.pick(SCARS)} on ${side} ${rng.pick(PARTS)}`;
    case 3:
      return rng.pick(TAIL_MARKS);
    default:
      return rng.pick(OTHER);
  }
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** A nickname of two or three invented syllables. */
export function nickname(rng: Rng): string {
  const n = rng.int(2, 3);
  return capitalise(Array.from({ length: n }, () => rng.pick(SYLLABLES)).join(''));
}

/** A synthetic animal: 2–5 trait tags and a few sentences of marking notes built from them. */
export function syntheticDescription(rng: Rng): SyntheticDescription {
  const tags = [...new Set(Array.from({ length: rng.int(2, 5) }, () => mark(rng)))];
  const sentences = tags.map((t) =>
    capitalise(
      rng.pick([
        `${t}.`,
        `${t}, clear on most photos.`,
        `${t}; check against the reference photos.`,
        `${t} (seen since the first detection).`,
      ]),
    ),
  );
  if (rng.chance(0.5)) sentences.push(capitalise(`${mark(rng)}, faint.`));
  if (rng.chance(0.3)) sentences.push('Synthetic benchmark individual.');
  const r = rng.next();
  return {
    nickname: rng.chance(0.6) ? nickname(rng) : null,
    sex: r < 0.45 ? 'female' : r < 0.8 ? 'male' : 'unknown',
    notes: sentences.join(' '),
    tags,
  };
}

function typo(rng: Rng, text: string): string {
  const [pattern, replacement] = rng.pick(TYPOS);
  return pattern.test(text) ? text.replace(pattern, replacement) : text.slice(0, -1);
}

/** One search a reviewer might type, with its kind for the breakdown. */
export interface SearchQuery {
  kind: 'code' | 'nickname' | 'one mark' | 'mark with a typo' | 'one term' | 'several marks';
  text: string;
}

/**
 * What reviewers type into the candidate search: a display code, a nickname, one remembered mark,
 * a mark with a typo, a single term, or two or three marks separated by commas or "and". `codes`
 * are display codes that exist.
 */
export function searchQueries(rng: Rng, count: number, codes: readonly string[]): SearchQuery[] {
  const queries: SearchQuery[] = [];
  for (let i = 0; i < count; i++) {
    const r = rng.next();
    if (r < 0.1) queries.push({ kind: 'code', text: rng.pick(codes) });
    else if (r < 0.2) queries.push({ kind: 'nickname', text: nickname(rng) });
    else if (r < 0.5) queries.push({ kind: 'one mark', text: mark(rng) });
    else if (r < 0.6) queries.push({ kind: 'mark with a typo', text: typo(rng, mark(rng)) });
    else if (r < 0.7) {
      const word = rng.pick([...ROSETTES, ...SCARS, ...TAIL_MARKS, 'notch', 'scar', 'kinked']);
      queries.push({ kind: 'one term', text: word });
    } else {
      const marks = Array.from({ length: rng.int(2, 3) }, () => mark(rng));
      queries.push({ kind: 'several marks', text: marks.join(rng.pick([', ', ' and ', '; '])) });
    }
  }
  return queries;
}
