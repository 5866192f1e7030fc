// The manifest for a given web address: used by webpack.config.js when it copies manifest.xml into dist/, and by
// test/manifestAddress.test.ts. Plain JavaScript with JSDoc types (checked by `tsc`, allowJs + checkJs) because the
// webpack configuration, which runs in Node without a TypeScript loader, imports it.

/** The address the source manifest (manifest.xml) points at: the development server of `npm start`. */
export const DEV_URL = 'https://localhost:3000/';

/** A build option that cannot be used; the message says what was wrong and how to write it. */
export class BuildOptionError extends Error {
  /** @param {string} message */
  constructor(message) {
    super(message);
    this.name = 'BuildOptionError';
  }
}

/**
 * The address the built files will be served from, checked and ending in "/" so that file names can be appended.
 * It must be absolute https (Office loads add-ins only over https), with no user name, password, query or fragment.
 * Example: normalisePublicUrl('https://host.example/longipane') → 'https://host.example/longipane/'.
 * @param {string} text
 * @returns {string}
 */
export function normalisePublicUrl(text) {
  const shape = 'Write it as https://host/path/, for example --env publicUrl=https://host.example/longipane/';
  /** @type {URL} */
  let url;
  try {
    url = new URL(text.trim());
  } catch {
    throw new BuildOptionError(`publicUrl "${text}" is not a web address. ${shape}`);
  }
  if (url.protocol !== 'https:') {
    throw new BuildOptionError(`publicUrl "${text}" must start with https:// (Excel loads add-ins only over HTTPS). ${shape}`);
  }
  if (url.username !== '' || url.password !== '') {
    throw new BuildOptionError(`publicUrl "${text}" must not contain a user name or password. ${shape}`);
  }
  if (url.search !== '' || url.hash !== '' || text.includes('?') || text.includes('#')) {
    throw new BuildOptionError(`publicUrl "${text}" must not contain a query (?) or a fragment (#). ${shape}`);
  }
  const path = url.pathname.endsWith('/') ? url.pathname : `${url.pathname}/`;
  return `${url.origin}${path}`;
}

/**
 * The manifest's four-part version (major.minor.build.revision, each 0–65535) from package.json's
 * major.minor.patch: '0.1.0' → '0.1.0.0'. A pre-release or build suffix ('1.0.0-rc.1') has no place in it and is
 * refused rather than dropped, so two different builds never carry the same manifest version.
 * @param {string} packageVersion
 * @returns {string}
 */
export function manifestVersion(packageVersion) {
  const m = /^(\d+)\.(\d+)\.(\d+)$/.exec(packageVersion);
  if (m === null || m.slice(1).some((part) => Number(part) > 65535 || (part.length > 1 && part.startsWith('0')))) {
    throw new BuildOptionError(
      `package.json's version "${packageVersion}" cannot be an add-in version: use three whole numbers up to 65535, like 1.4.2.`,
    );
  }
  return `${m[1]}.${m[2]}.${m[3]}.0`;
}

/**
 * The manifest text with every address under DEV_URL moved under `publicUrl` (already normalised) and the
 * <Version> set to `version`. Every other character is kept. Throws if the source has no address to move or if
 * any address would remain outside `publicUrl` (a localhost one left behind, say).
 * @param {string} xml the source manifest
 * @param {{ publicUrl: string, version: string }} options
 * @returns {string}
 */
export function manifestFor(xml, { publicUrl, version }) {
  let moved = 0;
  const out = xml
    .replace(/(DefaultValue|Override Value)="https:\/\/localhost:3000\/([^"]*)"/g, (_all, attr, rest) => {
      moved += 1;
      return `${attr}="${publicUrl}${rest}"`;
    })
    .replace(/<Version>[^<]*<\/Version>/, `<Version>${version}</Version>`);
  if (moved === 0) throw new BuildOptionError(`manifest.xml has no address under ${DEV_URL} to move.`);
  const elsewhere = [...out.matchAll(/(?:DefaultValue|Override Value)="([a-z]+:\/\/[^"]*)"/gi)]
    .map((m) => m[1] ?? '')
    .filter((u) => !u.startsWith(publicUrl));
  if (elsewhere.length > 0) {
    throw new BuildOptionError(`manifest.xml names addresses outside ${publicUrl}: ${elsewhere.join(', ')}`);
  }
  return out;
}
