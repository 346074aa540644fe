import { expect, type Page } from '@playwright/test';

/** The demo password (demo only). */
export const DEMO_PASSWORD = 'kasiri-demo-2026';

/** Signs in through the sign-in page. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page).not.toHaveURL(/sign-in/);
}
