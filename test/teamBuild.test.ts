/**
 * The build for a team (`npm run build -- --env publicUrl=https://host/path/`): the address is checked, every manifest
 * URL moves under it, the manifest's version comes from package.json. The second half reads the dist/ that
 * `npm test` builds with an address (https://intranet.example/apps/longipane/, a reserved example name, RFC 6761
 * §6.5) and checks it the way an administrator's Excel would meet it: no localhost anywhere, every URL under one
 * address and naming a file that dist/ holds, the version of package.json, and readable by the platform tooling's
 * own manifest reader without network.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { OfficeAddinManifest } from 'office-addin-manifest';
import { BuildOptionError, DEV_URL, manifestFor, manifestVersion, normalisePublicUrl } from '../scripts/manifestAddress.mjs';

const root = join(import.meta.dirname, '..');
const dist = join(root, 'dist');
const source = readFileSync(join(root, 'manifest.xml'), 'utf8');
const packageVersion = (JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as { version: string }).version;

/** Every URL-valued attribute of a manifest (DefaultValue, Override Value), in document order. */
function urls(xml: string): string[] {
  return [...xml.matchAll(/(?:DefaultValue|Override Value)="([a-z]+:\/\/[^"]*)"/gi)].map((m) => m[1] ?? '');
}

describe('normalisePublicUrl', () => {
  it('adds the final slash and keeps scheme, host, port and path', () => {
    expect(normalisePublicUrl('https://host.example/longipane')).toBe('https://host.example/longipane/');
    expect(normalisePublicUrl('https://host.example/longipane/')).toBe('https://host.example/longipane/');
    expect(normalisePublicUrl(' https://HOST.example:8443/a/b ')).toBe('https://host.example:8443/a/b/');
    expect(normalisePublicUrl('https://host.example')).toBe('https://host.example/');
  });

  it('refuses addresses Excel would not load or that cannot take file names, saying how to write one', () => {
    for (const bad of ['host.example/longipane', 'http://host.example/', 'ftp://host.example/', 'https://u:p@host.example/', 'https://host.example/?v=1', 'https://host.example/#x', '']) {
      expect(() => normalisePublicUrl(bad), bad).toThrow(BuildOptionError);
      expect(() => normalisePublicUrl(bad), bad).toThrow(/https:\/\/host\.example\/longipane\//);
    }
  });
});

describe('manifestVersion', () => {
  // The manifest's <Version> has up to four dot-separated parts of 0-65535 (add-in manifest reference, Version element).
  it('writes package.json major.minor.patch as a four-part version with revision 0', () => {
    expect(manifestVersion('0.1.0')).toBe('0.1.0.0');
    expect(manifestVersion('12.3.65535')).toBe('12.3.65535.0');
  });

  it('refuses versions a manifest cannot carry instead of dropping parts of them', () => {
    for (const bad of ['1.0.0-rc.1', '1.0.0+build.5', '1.0', '1.65536.0', '01.2.3', 'v1.2.3']) {
      expect(() => manifestVersion(bad), bad).toThrow(BuildOptionError);
    }
  });
});

describe('manifestFor', () => {
  it('moves every address of the source manifest under the given address and changes nothing else', () => {
    const out = manifestFor(source, { publicUrl: 'https://host.example/longipane/', version: '2.3.4.0' });
    const before = urls(source);
    const after = urls(out);
    expect(after).toEqual(before.map((u) => u.replace(DEV_URL, 'https://host.example/longipane/')));
    // Source location, icons, support page and the button's pane address: all of them (manifest.xml lists 9).
    expect(after).toHaveLength(9);
    expect(out).not.toMatch(/localhost/i);
    expect(out).toContain('<Version>2.3.4.0</Version>');
    // Putting the addresses and version back gives the source, character for character.
    const back = out.replaceAll('https://host.example/longipane/', DEV_URL).replace('<Version>2.3.4.0</Version>', /<Version>[^<]*<\/Version>/.exec(source)?.[0] ?? '');
    expect(back).toBe(source);
  });

  it('for any https address, every URL lands under it with its file name kept (property)', () => {
    const segment = fc.stringMatching(/^[a-z0-9][a-z0-9._~-]{0,11}$/);
    fc.assert(
      fc.property(fc.domain(), fc.option(fc.integer({ min: 1, max: 65535 }), { nil: undefined }), fc.array(segment, { maxLength: 4 }), (host, port, path) => {
        const publicUrl = normalisePublicUrl(`https://${host}${port === undefined ? '' : `:${port}`}/${path.join('/')}`);
        const out = manifestFor(source, { publicUrl, version: '1.0.0.0' });
        const moved = urls(out);
        expect(moved.map((u) => u.slice(publicUrl.length))).toEqual(urls(source).map((u) => u.slice(DEV_URL.length)));
        for (const u of moved) expect(u.startsWith(publicUrl)).toBe(true);
      }),
    );
  });

  it('refuses a manifest with an address outside the given one (a localhost URL left behind)', () => {
    const stray = source.replace('https://localhost:3000/assets/support.html"/>', 'https://localhost:3001/assets/support.html"/>');
    expect(() => manifestFor(stray, { publicUrl: 'https://host.example/longipane/', version: '1.0.0.0' })).toThrow(/localhost:3001/);
    expect(() => manifestFor('<OfficeApp/>', { publicUrl: 'https://host.example/', version: '1.0.0.0' })).toThrow(BuildOptionError);
  });
});

describe('dist/manifest.xml as npm test builds it (with an address)', () => {
  function built(): string {
    const path = join(dist, 'manifest.xml');
    if (!existsSync(path)) throw new Error('dist/manifest.xml is missing: run `npm test`, or `npm run build -- --env publicUrl=https://host.example/longipane/`.');
    return readFileSync(path, 'utf8');
  }

  /** The address the build was given: the source location without its file name. */
  function address(xml: string): string {
    const source = /<SourceLocation DefaultValue="([^"]*)"/.exec(xml)?.[1] ?? '';
    expect(source).toMatch(/^https:\/\/[^/]+\/(.*\/)?taskpane\.html$/);
    return source.slice(0, -'taskpane.html'.length);
  }

  it('contains no localhost address (dist/ must be built with --env publicUrl=…; npm test does)', () => {
    const xml = built();
    expect(xml, 'dist/ was built without an address; build it with npm run build -- --env publicUrl=https://host.example/longipane/').not.toMatch(/localhost/i);
    expect(address(xml)).not.toBe(DEV_URL);
  });

  it('has every URL under the one address, each naming a file dist/ holds', () => {
    const xml = built();
    const base = address(xml);
    const all = urls(xml);
    expect(all).toHaveLength(9);
    for (const u of all) {
      expect(u.startsWith(base), u).toBe(true);
      expect(existsSync(join(dist, ...u.slice(base.length).split('/'))), u).toBe(true);
    }
  });

  it("carries package.json's version as the add-in version", () => {
    expect(/<Version>([^<]*)<\/Version>/.exec(built())?.[1]).toBe(manifestVersion(packageVersion));
  });

  it("is read without network by the platform tooling's own manifest reader", async () => {
    built();
    const info = await OfficeAddinManifest.readManifestFile(join(dist, 'manifest.xml'));
    expect(info.id).toBe('21790eb3-f8fb-4cb2-8eb7-a6339bf428a9');
    expect(info.version).toBe(manifestVersion(packageVersion));
    expect(info.hosts).toEqual(['Workbook']);
    expect(info.officeAppType).toBe('TaskPaneApp');
  });
});
