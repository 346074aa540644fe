import { expect, test } from '@playwright/test';
import { SeededRandom } from '../../server/estimation/numeric/random';
import { simulateSecr, trapGrid } from '../../server/estimation/secr/simulate';
import { DEER_MICE, historiesFromOccasionSummary } from '../estimation/fixtures/published-data';
import { signIn } from './helpers';

test('an ecologist pastes the deer-mice histories and reads the model table and charts', async ({
  page,
}) => {
  await signIn(page, 'ecologist@demo.test');
  await page.getByTestId('project-nav').getByRole('link', { name: 'Estimates' }).click();
  await expect(page).toHaveURL(/\/estimates\/histories$/);

  // Histories built as the estimation tests build them: they reproduce the published summaries
  // (Otis et al. 1978 deer mice; Amstrup et al. 2005, p. 25).
  const histories = historiesFromOccasionSummary(DEER_MICE.u, DEER_MICE.m);
  await page.getByTestId('histories-input').fill(histories.join('\n'));
  await page.getByRole('button', { name: 'Estimate abundance' }).click();

  const table = page.getByTestId('model-table');
  await expect(table).toBeVisible();
  const mb = table.locator('tr[data-model="Mb"]');
  await expect(mb).toContainText('42.3'); // estimating-equation root 42.2557 [D]
  await expect(mb).toContainText('lowest AICc'); // AICc (n = S) selects Mb [D]
  await expect(table.locator('tr[data-model="Schnabel"] + tr.warning-row')).toContainText(
    'below the 38 animals',
  );
  await expect(page.getByText('n = S = 38', { exact: true })).toBeVisible();
  await expect(page.locator('mac-model-chart svg')).toBeVisible();
  await expect(page.locator('mac-frequency-chart svg')).toBeVisible();
  await expect(page.getByText("need a qualified analyst's review")).toBeVisible();
});

test('an ecologist fits SECR density on a synthetic survey and follows its progress', async ({
  page,
}) => {
  // Synthetic: 5 × 5 traps 100 m apart, σ = 50 m, 1.2 animals per hectare.
  const sim = simulateSecr(
    {
      traps: trapGrid(5, 5, 100),
      occasions: 5,
      detector: 'proximity',
      density: 1.2,
      g0OrLambda0: 0.25,
      sigma: 50,
      buffer: 200,
    },
    new SeededRandom(11),
  );
  await signIn(page, 'ecologist@demo.test');
  await page.goto('/p/kasiri-leopards/estimates/secr');
  await page
    .getByTestId('traps-input')
    .fill(['id,x,y', ...sim.traps.map((t) => `${t.id},${t.x},${t.y}`)].join('\n'));
  await page
    .getByTestId('captures-input')
    .fill(
      [
        'animal,occasion,trap',
        ...sim.captures.map((c) => `${c.animal},${c.occasion},${c.trap}`),
      ].join('\n'),
    );
  await page.getByLabel('Occasions').fill('5');
  await page.getByRole('button', { name: 'Fit density' }).click();
  const results = page.getByTestId('secr-results');
  await expect(results).toBeVisible({ timeout: 30_000 });
  await expect(results.getByTestId('density-km2')).toContainText('per km²');
  await expect(results.locator('mac-detection-chart svg')).toBeVisible();
  await expect(results.locator('mac-trap-plot svg')).toBeVisible();
});
