import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

test('a curator merges a possible duplicate with a reason, sees it in the history, and undoes it', async ({
  page,
}) => {
  await signIn(page, 'curator@demo.test');
  await page.goto('/p/kasiri-leopards/curate');
  await page.getByRole('tab', { name: 'Possible duplicates' }).click();
  const pair = page.getByTestId('duplicate').first();
  await expect(pair).toBeVisible();
  await pair.getByPlaceholder('what convinced you').fill('same rosettes on the shoulder');
  await pair
    .getByRole('button', { name: /^Merge .* into /, exact: false })
    .first()
    .click();
  await expect(
    page.getByText(/merged into .*: \d+ sightings and \d+ calls moved/).first(),
  ).toBeVisible();

  await page.getByRole('tab', { name: 'Identity changes' }).click();
  const changes = page.getByTestId('changes');
  await expect(changes.locator('li').first()).toContainText('merged into');
  await expect(changes.locator('li').first()).toContainText('same rosettes on the shoulder');
  page.once('dialog', (d) => void d.accept('merged by mistake'));
  await changes.locator('li').first().getByRole('button', { name: 'Undo' }).click();
  await expect(changes.locator('li').first()).toContainText('Undid a merge');
});

test('a curator decides a disputed sighting and sends the digest, which lands in the outbox', async ({
  page,
  browser,
}) => {
  await signIn(page, 'curator@demo.test');
  await page.goto('/p/kasiri-leopards/curate');
  const dispute = page.getByTestId('dispute').first();
  await expect(dispute).toBeVisible();
  await dispute.getByPlaceholder('why this decision').fill('the first reviewer is right');
  await dispute
    .getByRole('button', { name: /^Confirm as KHL-/ })
    .first()
    .click();
  await expect(page.getByText(/Dispute decided: confirmed as KHL-/)).toBeVisible();

  await page.getByRole('button', { name: 'E-mail the curators a digest now' }).click();
  await expect(page.getByText(/Digest sent to \d+ people/)).toBeVisible();
  const admin = await (await browser.newContext()).newPage();
  await signIn(admin, 'admin@demo.test');
  await admin.goto('/admin/outbox');
  await expect(admin.getByTestId('outbox-list')).toContainText(
    /possible duplicates in Kasiri Hills/,
  );
});
