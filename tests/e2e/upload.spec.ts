import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { expect, test } from '@playwright/test';
import { exifJpeg } from '../support/photo-fixtures';
import { signIn } from './helpers';

// Synthetic photos made by the test (piexifjs EXIF), uploaded through the real page.

test('a volunteer uploads a small card and watches sending and processing reach 100 %', async ({
  page,
}) => {
  const dir = join(process.cwd(), 'tests/.tmp/e2e-card');
  mkdirSync(dir, { recursive: true });
  const paths: string[] = [];
  for (let i = 0; i < 6; i++) {
    const path = join(dir, `IMG_${String(i + 1).padStart(4, '0')}.JPG`);
    writeFileSync(
      path,
      await exifJpeg(
        { dateTimeOriginal: `2026:07:03 21:0${i}:00`, make: 'Fieldcam' },
        { width: 800, height: 600, color: 0x20304000 + i * 0x1000 + 0xff },
      ),
    );
    paths.push(path);
  }
  const notPhoto = join(dir, 'notes.jpg');
  writeFileSync(notPhoto, 'this card was full');
  paths.push(notPhoto);

  await signIn(page, 'volunteer@demo.test');
  await page
    .getByTestId('project-nav')
    .getByTestId('nav-label')
    .filter({ hasText: 'Card uploads' })
    .click();
  await page.getByRole('link', { name: 'Upload a card' }).click();
  await page.locator('mat-form-field', { hasText: 'Deployment' }).click();
  await page.getByRole('option', { name: /KH01 · camera A/ }).click();
  await page.getByTestId('file-input').setInputFiles(paths);
  await expect(page.getByText('7 files')).toBeVisible();
  await page.getByTestId('start-upload').click();

  await expect(page.getByTestId('overall-progress')).toHaveAttribute('aria-valuenow', '100');
  await expect(page.getByTestId('upload-counts')).toContainText('6 accepted');
  await expect(page.getByTestId('upload-counts')).toContainText('1 rejected');
  await expect(page.getByTestId('rejected-files')).toContainText(
    'notes.jpg: This file is not a photo',
  );
  await expect(page.getByTestId('processing-counts')).toContainText('6 ready', { timeout: 60_000 });
  await expect(page.getByTestId('processing-progress')).toHaveAttribute('aria-valuenow', '100');
  await expect(page.getByTestId('processing-counts')).toContainText('done');

  await page.getByRole('link', { name: 'See the photos and flags of this card' }).click();
  await expect(page.getByTestId('upload-summary')).toContainText('6');
  await expect(page.locator('figure img')).toHaveCount(6);
});
