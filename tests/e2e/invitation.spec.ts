import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

test('an ecologist invites a new member who follows the e-mailed link, sets a password and signs in', async ({
  browser,
}) => {
  const email = `new.tracker.${Date.now()}@example.org`;

  const ecologist = await (await browser.newContext()).newPage();
  await signIn(ecologist, 'ecologist@demo.test');
  await ecologist.getByTestId('project-nav').getByRole('link', { name: 'Team' }).click();
  await ecologist.getByTestId('invite-email').fill(email);
  await ecologist.getByTestId('invite-role').click();
  await ecologist.getByRole('option', { name: 'Reviewer' }).click();
  await ecologist.getByRole('button', { name: 'Send invitation' }).click();
  await expect(ecologist.getByText(`Invitation sent to ${email}.`)).toBeVisible();

  const admin = await (await browser.newContext()).newPage();
  await signIn(admin, 'admin@demo.test');
  await admin.goto('/admin/outbox');
  await admin.getByTestId('outbox-list').getByText(email).first().click();
  const message = admin.getByTestId('outbox-message');
  await expect(message).toContainText('Invitation to Kasiri Hills leopard survey 2026');
  const text = await message.locator('pre').innerText();
  const link = /https?:\/\/\S+\/invitations\/\S+/.exec(text)?.[0];
  expect(link).toBeTruthy();

  const guest = await (await browser.newContext()).newPage();
  await guest.goto(new URL(link!).pathname);
  await expect(
    guest.getByRole('heading', { name: 'Join Kasiri Hills leopard survey 2026' }),
  ).toBeVisible();
  await guest.getByLabel('Your name').fill('Nia Tracker');
  await guest.getByLabel('Choose a password').fill('spotted-cat-trail-42');
  await guest.getByRole('button', { name: 'Join the project' }).click();
  await expect(guest).toHaveURL(/\/p\/kasiri-leopards\/overview/);
  await expect(guest.getByTestId('overview-role')).toHaveText('Reviewer');

  await guest.getByRole('button', { name: 'Account' }).click();
  await guest.getByTestId('sign-out').click();
  await expect(guest).toHaveURL(/sign-in/);
  await signIn(guest, email, 'spotted-cat-trail-42');
  await expect(
    guest.getByTestId('project-nav').getByRole('link', { name: 'Identify' }),
  ).toBeVisible();
});
