/**
 * The one place where browser tests find and start Chromium, so every browser test runs the same browser the same way.
 *
 * Which browser, in this order:
 *   1. CHROMIUM_PATH, when set (an explicit choice; it must exist);
 *   2. Debian's Chromium (`chromium` on the PATH, or /usr/bin/chromium), when it is installed;
 *   3. otherwise the headless Chromium that the npm package @sparticuz/chromium ships inside its own tarball
 *      (a dev dependency, so `npm ci` brings it with no system step and no download at install or run time; it is
 *      unpacked once into the system temporary folder, about 3 s).
 * There is no silent skip: if none of these can start, launching throws and the browser tests fail.
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';

/** The browser chosen for this run: where it is, where it came from, and the environment it needs. */
export interface ChosenBrowser {
  executablePath: string;
  source: 'CHROMIUM_PATH' | 'debian' | '@sparticuz/chromium';
  env: Record<string, string>;
}

/** Flags for a headless run on a machine with no network but the loopback: nothing reaches out on start. */
export const BROWSER_ARGS: readonly string[] = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-quic',
  '--no-first-run',
  '--disable-component-update',
  '--disable-sync',
  '--disable-dev-shm-usage',
];

function debianChromium(): string | null {
  try {
    const onPath = execFileSync('which', ['chromium'], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] }).trim();
    if (onPath && existsSync(onPath)) return onPath;
  } catch {
    // not on the PATH: try the Debian location below
  }
  return existsSync('/usr/bin/chromium') ? '/usr/bin/chromium' : null;
}

/** Finds the browser (see the file comment for the order). Throws with a plain message when there is none. */
export async function findChromium(): Promise<ChosenBrowser> {
  const baseEnv = Object.fromEntries(
    Object.entries(process.env).filter((e): e is [string, string] => typeof e[1] === 'string'),
  );
  const explicit = process.env.CHROMIUM_PATH;
  if (explicit) {
    if (!existsSync(explicit)) throw new Error(`CHROMIUM_PATH is set to ${explicit}, but no file is there.`);
    return { executablePath: explicit, source: 'CHROMIUM_PATH', env: baseEnv };
  }
  const debian = debianChromium();
  if (debian) return { executablePath: debian, source: 'debian', env: baseEnv };
  const packaged = (await import('@sparticuz/chromium')).default;
  packaged.setGraphicsMode = false;
  const executablePath = await packaged.executablePath();
  // The package's fonts are unpacked beside the browser; point fontconfig at them so text renders on a machine
  // with no fonts installed.
  return {
    executablePath,
    source: '@sparticuz/chromium',
    env: { ...baseEnv, FONTCONFIG_PATH: join(tmpdir(), 'fonts') },
  };
}

/** Starts Chromium with a persistent profile in `profileDir` (downloads allowed), ready for one test file. */
export async function launchChromium(
  profileDir: string,
  options: { viewport?: { width: number; height: number }; ignoreHTTPSErrors?: boolean } = {},
): Promise<{ context: BrowserContext; browser: ChosenBrowser }> {
  const browser = await findChromium();
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: browser.executablePath,
    env: browser.env,
    headless: true,
    acceptDownloads: true,
    viewport: options.viewport ?? { width: 1280, height: 900 },
    ignoreHTTPSErrors: options.ignoreHTTPSErrors ?? false,
    args: [...BROWSER_ARGS],
  });
  return { context, browser };
}
