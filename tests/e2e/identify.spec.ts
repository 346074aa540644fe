import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

test('a second reviewer identifies demo sightings with the keyboard: match, new individual, unidentifiable, skip', async ({
  page,
}) => {
  await signIn(page, 'reviewer2@demo.test');
  await page.goto('/p/kasiri-leopards/identify');
  const info = page.getByTestId('sighting-info');
  const message = page.getByTestId('identify-message');
  await expect(info).toBeVisible();
  await expect(page.getByTestId('candidates').locator('li').first()).toBeVisible();
  const before = await page.request
    .get('/api/projects/kasiri-leopards/progress')
    .then((r) => r.json());

  // Step through candidates and photos, mirror and zoom the compare view, then match.
  await page.keyboard.press('j');
  await page.keyboard.press('k');
  await page.keyboard.press('ArrowRight');
  await page.keyboard.press('f');
  await page.keyboard.press('+');
  await expect(page.getByText('zoom 125%')).toBeVisible();
  await page.keyboard.press('0');
  let current = await info.textContent();
  await page.keyboard.press('m');
  await expect(message).toContainText('Matched to');
  await expect(info).not.toHaveText(current ?? '');

  // Type what you see: / focuses the description box, Escape returns to the keys.
  await page.keyboard.press('/');
  await page.keyboard.type('notched right ear, kinked tail tip');
  await expect(page.getByTestId('candidate-search')).toHaveValue(
    'notched right ear, kinked tail tip',
  );
  await page.keyboard.press('Escape');

  current = await info.textContent();
  await page.keyboard.press('n');
  await page.keyboard.type('Tumaini');
  await page.keyboard.press('Enter');
  await expect(message).toContainText('Recorded as a new individual');
  await expect(info).not.toHaveText(current ?? '');

  current = await info.textContent();
  await page.keyboard.press('x');
  await expect(message).toContainText('unidentifiable');
  await expect(info).not.toHaveText(current ?? '');

  current = await info.textContent();
  await page.keyboard.press('s');
  await expect(message).toContainText('Skipped');

  const after = await page.request
    .get('/api/projects/kasiri-leopards/progress')
    .then((r) => r.json());
  const calls = (p: { sightings: Record<string, number> }) =>
    p.sightings['open']! + p.sightings['proposed']!;
  // Three calls were made; each moved a sighting on from open or proposed.
  expect(calls(after)).toBeLessThan(calls(before));
});

test('the catalogue lists the demo individuals and opens an individual page with its sightings', async ({
  page,
}) => {
  await signIn(page, 'reviewer@demo.test');
  await page.goto('/p/kasiri-leopards/catalogue');
  const table = page.getByTestId('catalogue-table');
  await expect(table.locator('tr.mat-mdc-row').first()).toBeVisible();
  expect(await table.locator('tr.mat-mdc-row').count()).toBeGreaterThanOrEqual(12);
  await page.getByTestId('catalogue-search').fill('KHL-001');
  await expect(table.locator('tr.mat-mdc-row')).toHaveCount(1);
  await table.getByRole('link', { name: 'KHL-001' }).click();
  await expect(page.getByTestId('individual-code')).toContainText('KHL-001');
  await expect(page.getByTestId('timeline').locator('li').first()).toBeVisible();
  await expect(page.getByText('Do not share this map outside the team')).toBeVisible();
});

test('P draws the coat-pattern points matched between the sighting and the reference shown', async ({
  page,
}) => {
  await signIn(page, 'curator@demo.test');
  await page.goto('/p/kasiri-leopards/identify');
  await expect(page.getByTestId('sighting-info')).toBeVisible();
  const drawing = page.getByTestId('pattern-matches');
  // The demo's features are computed in the background after start: reload until they are.
  await expect(async () => {
    await page.reload();
    await expect(page.getByTestId('sighting-info')).toBeVisible();
    await page.keyboard.press('p');
    await expect(drawing).toBeVisible({ timeout: 3000 });
  }).toPass({ timeout: 90_000 });
  await expect(page.getByText(/Coat pattern: \d+ matching points/)).toBeVisible();
  await expect(page.getByTestId('toggle-matches')).toHaveAttribute('aria-pressed', 'true');
  await page.keyboard.press('p');
  await expect(drawing).toBeHidden();
});
