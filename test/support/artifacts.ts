/**
 * Screenshots and rendered files for a person to look at: written to artifacts/ (git-ignored) only when ARTIFACTS=1
 * (the full run sets it), so the default run spends no time on them.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import type { ElementHandle, Page } from 'puppeteer-core';

export const ARTIFACTS_ON = process.env.ARTIFACTS === '1';
export const ARTIFACTS_DIR = join(__dirname, '../../artifacts');

/** Writes artifacts/<name> when ARTIFACTS=1. */
export function saveArtifact(name: string, data: string | Buffer): void {
  if (!ARTIFACTS_ON) return;
  const file = join(ARTIFACTS_DIR, name);
  mkdirSync(dirname(file), { recursive: true });
  writeFileSync(file, data);
}

/** A PNG screenshot of a page (full length) or an element into artifacts/<name>.png when ARTIFACTS=1. */
export async function screenshot(target: Page | ElementHandle, name: string, options: { fullPage?: boolean } = {}): Promise<void> {
  if (!ARTIFACTS_ON) return;
  const file = join(ARTIFACTS_DIR, `${name}.png`);
  mkdirSync(dirname(file), { recursive: true });
  if ('bringToFront' in target) {
    await target.bringToFront(); // a background tab cannot be captured
    await target.screenshot({ path: file as `${string}.png`, fullPage: options.fullPage ?? true });
  } else {
    await target.screenshot({ path: file as `${string}.png` });
  }
}
