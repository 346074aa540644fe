import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

test('an ecologist sees what a public export leaves out and downloads the Camtrap DP package', async ({
  page,
}) => {
  await signIn(page, 'ecologist@demo.test');
  await page.goto('/p/kasiri-leopards/exports');
  await expect(page.getByText('Positions rounded to 0.1° (sensitivity high).')).toBeVisible();
  await expect(page.getByTestId('generalisation')).toContainText('2027-06-30');
  // The water-source station is named as left out, with what it is.
  await expect(page.getByText(/deployment\(s\) at sensitive sites left out/)).toContainText(
    'KH15 (water source)',
  );
  await expect(page.getByText(/photos of people or vehicles left out/)).toBeVisible();

  await page.getByRole('checkbox', { name: /Put the photo files/ }).click();
  const download = page.waitForEvent('download');
  await page.getByTestId('download-camtrap').click();
  const file = await download;
  expect(file.suggestedFilename()).toBe('kasiri-leopards-camtrap-dp-public.zip');
  const bytes = readFileSync(await file.path());
  expect(bytes.subarray(0, 2).toString()).toBe('PK');
  expect(bytes.includes(Buffer.from('datapackage.json'))).toBe(true);

  // Choosing the private backup shows its caution.
  await page.getByRole('radio', { name: /Private backup/ }).click();
  await expect(page.getByText('A private backup holds exact coordinates')).toBeVisible();
  await expect(page.getByText('Exact positions.')).toBeVisible();
});

test('an admin downloads a backup and imports a Camtrap DP package into a new project', async ({
  page,
  browser,
}) => {
  // The ecologist's package (tables only) is what the admin imports.
  const ecologist = await browser.newPage();
  await signIn(ecologist, 'ecologist@demo.test');
  await ecologist.goto('/p/kasiri-leopards/exports');
  await ecologist.getByRole('checkbox', { name: /Put the photo files/ }).click();
  const exported = ecologist.waitForEvent('download');
  await ecologist.getByTestId('download-camtrap').click();
  // Kept outside the page's own download folder, which goes when the page closes.
  const packagePath = test.info().outputPath('package.zip');
  await (await exported).saveAs(packagePath);
  await ecologist.close();

  await signIn(page, 'admin@demo.test');
  await page.goto('/admin/data');
  const backup = page.waitForEvent('download');
  await page.getByTestId('download-backup').click();
  expect((await backup).suggestedFilename()).toMatch(/^maculo-backup-.*\.zip$/);

  await page.getByTestId('import-file').setInputFiles(packagePath);
  const report = page.getByTestId('import-report');
  await expect(report).toBeVisible({ timeout: 60_000 });
  await expect(report).toContainText('Imported into');
  await expect(report).toContainText("The package's coordinates were rounded to 0.1 degrees");
  await report.getByRole('link', { name: 'kasiri-leopards-2' }).click();
  await expect(page).toHaveURL(/\/p\/kasiri-leopards-2\/overview/);
});
