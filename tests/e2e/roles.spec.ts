import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

const NAV = [
  'Overview',
  'Stations',
  'Card uploads',
  'Sort',
  'Identify',
  'Catalogue',
  'Curate',
  'Estimates',
  'Exports',
  'Team',
];

const EXPECTED: Record<string, string[]> = {
  volunteer: ['Overview', 'Stations', 'Card uploads', 'Team'],
  reviewer: ['Overview', 'Stations', 'Card uploads', 'Sort', 'Identify', 'Catalogue', 'Team'],
  curator: [
    'Overview',
    'Stations',
    'Card uploads',
    'Sort',
    'Identify',
    'Catalogue',
    'Curate',
    'Team',
  ],
  ecologist: NAV,
};

for (const [role, items] of Object.entries(EXPECTED)) {
  test(`a ${role} signs in and sees the ${role}'s navigation`, async ({ page }) => {
    await signIn(page, `${role}@demo.test`);
    await expect(page).toHaveURL(/\/p\/kasiri-leopards\/overview/);
    const nav = page.getByTestId('project-nav');
    await expect(nav.getByTestId('nav-label')).toHaveText(items);
    await expect(page.getByTestId('current-role')).toHaveText(
      role[0]!.toUpperCase() + role.slice(1),
    );
    await page.getByRole('button', { name: 'Account' }).click();
    await expect(page.getByTestId('admin-link')).toHaveCount(0);
  });
}

test('a volunteer who types the address of a higher page is turned away', async ({ page }) => {
  await signIn(page, 'volunteer@demo.test');
  await page.goto('/p/kasiri-leopards/estimates');
  await expect(page.getByText('Not open to your role')).toBeVisible();
});

test('the admin signs in and reaches administration and every project', async ({ page }) => {
  await signIn(page, 'admin@demo.test');
  await expect(page).toHaveURL(/\/projects/);
  // The demo project (an import in another test may add a second project of the same title).
  const demo = page.locator('a[href="/p/kasiri-leopards/overview"]');
  await expect(demo).toContainText('Kasiri Hills leopard survey 2026');
  await page.getByRole('button', { name: 'Account' }).click();
  await page.getByTestId('admin-link').click();
  await expect(page.getByRole('heading', { name: 'Administration' })).toBeVisible();
  await expect(page.getByTestId('users')).toContainText('volunteer@demo.test');
});

test('an unknown address shows the not-found page', async ({ page }) => {
  await page.goto('/no/such/page');
  await expect(page.getByText('Page not found')).toBeVisible();
});
