#!/usr/bin/env node
// Renders public/icons/*.svg to the PNG sizes the web manifest lists, using
// headless Chromium (Debian package) through playwright-core from tests/node_modules.
// Run: node scripts/make-icons.mjs   (after scripts/setup.sh). Output is committed.
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { launchChromium } from '../tests/e2e/browser.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const icons = join(root, 'public', 'icons');
const jobs = [
  ['icon.svg', 'icon-192.png', 192],
  ['icon.svg', 'icon-512.png', 512],
  ['maskable.svg', 'maskable-512.png', 512],
  ['icon.svg', 'apple-touch-icon.png', 180],
];

const browser = await launchChromium();
try {
  const page = await browser.newPage();
  for (const [src, out, size] of jobs) {
    const svg = readFileSync(join(icons, src), 'utf8');
    await page.setViewportSize({ width: size, height: size });
    await page.setContent(
      `<!doctype html><html><body style="margin:0;background:transparent">` +
        `<img id="i" width="${size}" height="${size}" src="data:image/svg+xml;base64,${Buffer.from(svg).toString('base64')}">` +
        `</body></html>`,
    );
    await page.waitForFunction(() => document.getElementById('i').complete);
    await page.locator('#i').screenshot({ path: join(icons, out), omitBackground: true });
    console.log(`wrote public/icons/${out} (${size}x${size})`);
  }
} finally {
  await browser.close();
}
