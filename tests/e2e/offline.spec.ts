import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { expect, test } from '@playwright/test';
import { signIn } from './helpers';

const DIST = join(process.cwd(), 'dist/maculo/browser');

// Strings that look like URLs but are never fetched: XML/JSON-schema namespace identifiers and a
// documentation link inside an Angular error message. Template strings (`http://[${host}]`) are
// not addresses and do not match.
const IDENTIFIERS = [
  /^http:\/\/www\.w3\.org\//,
  /^https?:\/\/json-schema\.org\//,
  /^https:\/\/angular\.dev\//,
  // Leaflet's attribution link text; the map's attribution control is off and nothing is fetched.
  /^https:\/\/leafletjs\.com\/?$/,
];

function files(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? files(join(dir, e.name)) : [join(dir, e.name)],
  );
}

test('the production build references no external resource', () => {
  const found: string[] = [];
  for (const file of files(DIST).filter((f) => /\.(html|css|js)$/.test(f))) {
    const text = readFileSync(file, 'utf8');
    for (const match of text.matchAll(/https?:\/\/[A-Za-z0-9][^\s"'`)<>\\]*/g)) {
      if (!IDENTIFIERS.some((re) => re.test(match[0])))
        found.push(`${file.slice(DIST.length)}: ${match[0]}`);
    }
    if (/\.(html|css)$/.test(file)) {
      expect(text).not.toMatch(/url\(\s*["']?(https?:)?\/\//);
      expect(text).not.toMatch(/(src|href)=["']?(https?:)?\/\//);
    }
  }
  expect(found).toEqual([]);
  expect(files(DIST).some((f) => /work-sans.*\.woff2$/.test(f))).toBe(true);
  expect(files(DIST).some((f) => /material-symbols-outlined.*\.woff2$/.test(f))).toBe(true);
});

test('pages load only from the app itself, fonts included', async ({ page, baseURL }) => {
  const foreign: string[] = [];
  const fonts: string[] = [];
  page.on('request', (req) => {
    const url = req.url();
    if (url.startsWith('data:') || url.startsWith('blob:')) return;
    if (!url.startsWith(baseURL!)) foreign.push(url);
    if (req.resourceType() === 'font') fonts.push(url);
  });
  await signIn(page, 'ecologist@demo.test');
  await page
    .getByTestId('project-nav')
    .getByTestId('nav-label')
    .filter({ hasText: 'Team' })
    .click();
  await expect(page.getByTestId('members')).toBeVisible();
  await page.evaluate(() => document.fonts.ready);
  expect(foreign).toEqual([]);
  expect(fonts.some((f) => f.includes('work-sans'))).toBe(true);
  expect(fonts.some((f) => f.includes('material-symbols'))).toBe(true);
});
