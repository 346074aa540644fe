/** What a key press means on the Identify screen. */
export type IdentifyAction =
  | 'next-candidate'
  | 'previous-candidate'
  | 'next-photo'
  | 'previous-photo'
  | 'next-reference'
  | 'match'
  | 'new'
  | 'unidentifiable'
  | 'skip'
  | 'mirror'
  | 'matched-points'
  | 'zoom-in'
  | 'zoom-out'
  | 'zoom-reset'
  | 'brighter'
  | 'darker'
  | 'more-contrast'
  | 'less-contrast'
  | 'search'
  | 'help';

const KEYS: Record<string, IdentifyAction> = {
  j: 'next-candidate',
  arrowdown: 'next-candidate',
  k: 'previous-candidate',
  arrowup: 'previous-candidate',
  arrowright: 'next-photo',
  arrowleft: 'previous-photo',
  r: 'next-reference',
  m: 'match',
  enter: 'match',
  n: 'new',
  x: 'unidentifiable',
  s: 'skip',
  f: 'mirror',
  p: 'matched-points',
  '+': 'zoom-in',
  '=': 'zoom-in',
  '-': 'zoom-out',
  '0': 'zoom-reset',
  '.': 'brighter',
  ',': 'darker',
  "'": 'more-contrast',
  ';': 'less-contrast',
  '/': 'search',
  '?': 'help',
};

/** Maps a key to an action on the Identify screen, or null. */
export function identifyKeyAction(key: string): IdentifyAction | null {
  return KEYS[key.toLowerCase()] ?? null;
}

/** The legend shown beside the compare view. */
export const IDENTIFY_HELP: [string, string][] = [
  ['J K / ↓ ↑', 'next / previous candidate'],
  ['← →', 'photos of this event'],
  ['R', 'next reference photo'],
  ['M or Enter', 'match the candidate'],
  ['N', 'new individual'],
  ['X', 'unidentifiable'],
  ['S', 'skip for now'],
  ['F', 'mirror the reference'],
  ['P', 'show / hide matched coat points'],
  ['+ − 0', 'zoom both photos'],
  [', .', 'darker / brighter'],
  ["; '", 'less / more contrast'],
  ['/', 'type what you see'],
];
