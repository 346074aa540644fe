import type { Flank, Quality, SortLabel } from '../../../shared/sort';

/** What a key press means on the Sort screen. */
export type SortAction =
  | { kind: 'label'; label: Exclude<SortLabel, 'animal'> }
  | { kind: 'target' }
  | { kind: 'pick-species' }
  | { kind: 'count'; count: number }
  | { kind: 'photo'; step: 1 | -1 }
  | { kind: 'event'; step: 1 | -1 }
  | { kind: 'undo' }
  | { kind: 'view' }
  | { kind: 'close' }
  | { kind: 'help' }
  | { kind: 'flank'; flank: Flank }
  | { kind: 'quality'; quality: Quality }
  | { kind: 'best-photo' }
  | { kind: 'save-sighting' }
  | { kind: 'none' };

/** The screen's modes: labelling, or describing the sightings of a target-species event. */
export type SortMode = 'label' | 'sighting';

const LABEL_KEYS: Record<string, SortAction> = {
  b: { kind: 'label', label: 'blank' },
  h: { kind: 'label', label: 'human' },
  v: { kind: 'label', label: 'vehicle' },
  u: { kind: 'label', label: 'unknown' },
  t: { kind: 'target' },
  a: { kind: 'pick-species' },
  z: { kind: 'undo' },
  j: { kind: 'event', step: 1 },
  k: { kind: 'event', step: -1 },
  arrowdown: { kind: 'event', step: 1 },
  arrowup: { kind: 'event', step: -1 },
  arrowright: { kind: 'photo', step: 1 },
  arrowleft: { kind: 'photo', step: -1 },
  enter: { kind: 'view' },
  ' ': { kind: 'view' },
  escape: { kind: 'close' },
  '?': { kind: 'help' },
};

const SIGHTING_KEYS: Record<string, SortAction> = {
  l: { kind: 'flank', flank: 'left' },
  r: { kind: 'flank', flank: 'right' },
  o: { kind: 'flank', flank: 'both' },
  f: { kind: 'flank', flank: 'front' },
  k: { kind: 'flank', flank: 'back' },
  u: { kind: 'flank', flank: 'unknown' },
  g: { kind: 'quality', quality: 'good' },
  a: { kind: 'quality', quality: 'fair' },
  p: { kind: 'quality', quality: 'poor' },
  s: { kind: 'best-photo' },
  enter: { kind: 'save-sighting' },
  arrowright: { kind: 'photo', step: 1 },
  arrowleft: { kind: 'photo', step: -1 },
  escape: { kind: 'close' },
  z: { kind: 'undo' },
  '?': { kind: 'help' },
};

/** Maps a key to an action; digits 1–9 set how many animals the next animal label counts. */
export function sortKeyAction(key: string, mode: SortMode, ctrl = false): SortAction {
  const k = key.toLowerCase();
  if (ctrl && k === 'z') return { kind: 'undo' };
  if (ctrl) return { kind: 'none' };
  if (mode === 'label' && /^[1-9]$/.test(k)) return { kind: 'count', count: Number(k) };
  return (mode === 'label' ? LABEL_KEYS : SIGHTING_KEYS)[k] ?? { kind: 'none' };
}

/** The key legend shown on screen, per mode. */
export const KEY_HELP: Record<SortMode, [string, string][]> = {
  label: [
    ['B', 'blank'],
    ['H', 'people'],
    ['V', 'vehicle'],
    ['U', 'unknown'],
    ['T', 'target species'],
    ['A', 'other animal…'],
    ['2–9', 'count, then T or A'],
    ['Z', 'undo last label'],
    ['← →', 'photo'],
    ['J K / ↓ ↑', 'next / previous event'],
    ['Enter', 'zoom'],
  ],
  sighting: [
    ['L R O', 'left, right, both flanks'],
    ['F K U', 'front, back, unknown'],
    ['G A P', 'good, fair, poor quality'],
    ['S', 'this photo is the best'],
    ['drag', 'draw a crop box'],
    ['Enter', 'save sighting'],
    ['Esc', 'skip the rest'],
  ],
};
