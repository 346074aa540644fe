import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

test('a reviewer sorts 20 demo events with the keyboard alone, including undo and a sighting', async ({
  page,
}) => {
  await signIn(page, 'reviewer2@demo.test');
  await page.goto('/p/kasiri-leopards/sort');
  const info = page.getByTestId('event-info');
  const counter = page.getByTestId('sorted-count');
  await expect(info).toBeVisible();
  const before = await page.request
    .get('/api/projects/kasiri-leopards/progress')
    .then((r) => r.json());

  // Move between photos and events without labelling.
  await page.keyboard.press('ArrowRight');
  await page.keyboard.press('j');
  await page.keyboard.press('k');

  const keys = ['b', 'v', 'u', 'b', 'b', 'h', 'b', 'u', 'b', 'v'];
  for (const key of keys) {
    const current = await info.textContent();
    await page.keyboard.press(key);
    await expect(info).not.toHaveText(current ?? '');
  }
  await expect(counter).toHaveText('10 sorted this session');

  // Undo takes the last label back and returns to that event.
  await page.keyboard.press('z');
  await expect(counter).toHaveText('9 sorted this session');
  await expect(page.getByTestId('event-label')).toHaveCount(0);
  await page.keyboard.press('b');
  await expect(counter).toHaveText('10 sorted this session');

  // The target species: T opens the sighting editor; L (left flank), G (good), Enter saves it.
  await page.keyboard.press('t');
  const draft = page.getByTestId('sighting-draft');
  await expect(draft).toBeVisible();
  await page.keyboard.press('l');
  await page.keyboard.press('g');
  await expect(draft).toContainText('left');
  await expect(draft).toContainText('good');
  await page.keyboard.press('Enter');
  await expect(draft).toHaveCount(0);
  await expect(counter).toHaveText('11 sorted this session');
  const withSighting = await page.request
    .get('/api/projects/kasiri-leopards/progress')
    .then((r) => r.json());
  expect(withSighting.sightings.open).toBe(before.sightings.open + 1);
  // …and Z removes that label again, with its open sighting.
  await page.keyboard.press('z');
  await expect(counter).toHaveText('10 sorted this session');
  const undone = await page.request
    .get('/api/projects/kasiri-leopards/progress')
    .then((r) => r.json());
  expect(undone.sightings.open).toBe(before.sightings.open);

  // A species from the picker: A, then the search box, Enter.
  await page.keyboard.press('a');
  await page.keyboard.type('porcupine');
  await page.keyboard.press('Enter');
  await expect(counter).toHaveText('11 sorted this session');

  for (let i = 0; i < 9; i++) {
    const current = await info.textContent();
    await page.keyboard.press(i % 3 === 0 ? 'u' : 'b');
    await expect(info).not.toHaveText(current ?? '');
  }
  await expect(counter).toHaveText('20 sorted this session');
  const after = await page.request
    .get('/api/projects/kasiri-leopards/progress')
    .then((r) => r.json());
  expect(after.events.sorted).toBe(before.events.sorted + 20);
});
