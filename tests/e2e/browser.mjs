// Launches Debian's Chromium through playwright-core. Never downloads a browser.
import { existsSync } from 'node:fs';
import { chromium } from 'playwright-core';

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH || '/usr/bin/chromium';

export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/**
 * Start Chromium. playwright-core gives every launch a fresh temporary user-data-dir
 * (and deletes it on close), so no state leaks between runs.
 */
export async function launchChromium() {
  if (!existsSync(CHROMIUM_PATH)) {
    throw new Error(`Chromium not found at ${CHROMIUM_PATH}: run scripts/setup.sh (apt-get install chromium)`);
  }
  return chromium.launch({ executablePath: CHROMIUM_PATH, headless: true, args: CHROMIUM_ARGS });
}
