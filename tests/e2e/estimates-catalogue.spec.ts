import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

// The demo catalogue is synthetic (seeds/): 20 paired stations, 60 days, painted leopards.

test('an ecologist builds a session from the demo catalogue, runs the models, saves and prints', async ({
  page,
}) => {
  await signIn(page, 'ecologist@demo.test');
  await page.goto('/p/kasiri-leopards/estimates');
  await page.getByRole('tab', { name: "From this project's catalogue" }).click();
  await expect(page).toHaveURL(/\/estimates\/catalogue$/);

  // The form starts from the deployments' span, in the project's time zone.
  await expect(page.getByTestId('first-day')).toHaveValue('2026-07-01');
  await expect(page.getByTestId('last-day')).toHaveValue('2026-08-30');

  await page.getByRole('button', { name: 'Build session' }).click();
  await expect(page.getByTestId('session-summary')).toContainText('occasions at 20 of 20 stations');
  await expect(page.getByTestId('effort-heatmap').locator('svg')).toBeVisible();
  await expect(page.getByTestId('history-heatmap').locator('svg')).toBeVisible();

  const download = page.waitForEvent('download');
  await page.getByTestId('csv-effort').click();
  const file = await (await download).path();
  const lines = readFileSync(file, 'utf8').split('\r\n');
  expect(lines[0]?.startsWith('station,occasion_1,occasion_2')).toBe(true);
  expect(lines.filter((l) => l.startsWith('KH')).length).toBe(20);

  await page.getByRole('button', { name: 'Run models' }).click();
  const results = page.getByTestId('session-results');
  await expect(results.getByTestId('model-table')).toBeVisible();
  await expect(results.locator('tr[data-model="M0"]')).toBeVisible();
  await expect(results.getByText(/n = S = \d+/).first()).toBeVisible();
  await expect(results.getByTestId('two-step-table')).toBeVisible();
  await expect(results.getByText('Sollmann et al. 2011').first()).toBeVisible();
  await expect(results.getByTestId('flank-policy')).toContainText('Left-flank histories');

  await page.getByTestId('analysis-name').fill('Dry season, left flanks');
  await page.getByRole('button', { name: 'Save analysis' }).click();
  await expect(page).toHaveURL(/\/estimates\/analyses\/[0-9a-f]{20}$/);
  const analysis = page.getByTestId('analysis-page');
  await expect(analysis.getByRole('heading', { name: 'Dry season, left flanks' })).toBeVisible();
  await expect(analysis.getByTestId('freeze-hash')).toHaveText(/^[0-9a-f]{12}$/);
  await expect(analysis.getByTestId('freeze-banner')).toHaveCount(0);
  await expect(analysis.getByTestId('model-table')).toBeVisible();

  await page.getByRole('tab', { name: 'Saved analyses' }).click();
  await expect(page.getByTestId('analyses-table')).toContainText('Dry season, left flanks');
  await page.getByRole('link', { name: 'Dry season, left flanks' }).click();

  await page.getByRole('link', { name: 'Printable report' }).click();
  const report = page.getByTestId('analysis-report');
  await expect(report.getByRole('heading', { name: 'Dry season, left flanks' })).toBeVisible();
  await expect(report.getByText('inputs match the data freeze')).toBeVisible();
  await page.emulateMedia({ media: 'print' });
  // In print, only the report shows: the app's toolbar and tabs are hidden around it.
  await expect(report).toBeVisible();
  await expect(page.getByRole('tab', { name: 'Saved analyses' })).toBeHidden();
  await expect(page.getByRole('button', { name: 'Print or save as PDF' })).toBeHidden();
  const box = await report.boundingBox();
  expect(box?.y).toBeLessThan(40); // the page's own padding only
  // Browser print to PDF: the whole report, over several pages (nothing cut at the first).
  const pdf = (await page.pdf({ format: 'A4' })).toString('latin1');
  expect(pdf.startsWith('%PDF-')).toBe(true);
  expect(pdf.match(/\/Type\s*\/Page[^s]/g)?.length ?? 0).toBeGreaterThan(1);
});
