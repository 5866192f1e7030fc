// @vitest-environment jsdom
/**
 * Offline checks of manifest.xml: the element order the add-in-only manifest schema prescribes for OfficeApp
 * (Office Add-ins manifest schema, "OfficeApp" element reference: Id, Version, ProviderName, DefaultLocale,
 * DisplayName, Description, IconUrl, HighResolutionIconUrl, SupportUrl, AppDomains, Hosts, Requirements,
 * DefaultSettings, Permissions, VersionOverrides), https everywhere, icons present at their declared pixel sizes.
 * The online validation (`npm run validate`) needs network and is not part of the test run. The same checks run on
 * the manifest `npm test` builds into dist/ for an address (test/teamBuild.test.ts checks the address itself).
 */
import { readFileSync, existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { OfficeAddinManifest } from 'office-addin-manifest';

const root = join(import.meta.dirname, '..');
const dist = join(root, 'dist');

/** Width and height from a PNG's IHDR chunk (PNG specification, ISO/IEC 15948 §11.2.2: bytes 16-23, big-endian). */
function pngSize(path: string): { width: number; height: number } {
  const b = readFileSync(path);
  expect(b.subarray(0, 8).toString('hex')).toBe('89504e470d0a1a0a'); // PNG signature (ISO/IEC 15948 §5.2)
  expect(b.subarray(12, 16).toString('ascii')).toBe('IHDR');
  return { width: b.readUInt32BE(16), height: b.readUInt32BE(20) };
}

/**
 * The same checks for the source manifest (addresses under https://localhost:3000/, assets in the repository) and for
 * the one `npm test` builds into dist/ with an address (assets in dist/): the build must keep it valid.
 */
const MANIFESTS = [
  { label: 'manifest.xml', file: join(root, 'manifest.xml'), files: root },
  { label: 'dist/manifest.xml (built with an address)', file: join(dist, 'manifest.xml'), files: dist },
];

describe.each(MANIFESTS)('$label', ({ file, files }) => {
  if (file.startsWith(dist) && !existsSync(file)) throw new Error('dist/manifest.xml is missing: run `npm test`, or npm run build -- --env publicUrl=https://host.example/longipane/');
  const xml = readFileSync(file, 'utf8');
  // The standard DOMParser (jsdom's, in this test environment) parses the manifest as XML.
  const doc = new DOMParser().parseFromString(xml, 'application/xml');
  const app = doc.documentElement;
  /** The address every URL sits under: the source location without its file name. */
  const base = (doc.querySelector('DefaultSettings > SourceLocation')?.getAttribute('DefaultValue') ?? '').replace(/taskpane\.html$/, '');

  /** Maps an address under `base` + assets/ to the file in the manifest's assets folder. */
  function assetPath(url: string): string {
    if (!url.startsWith(`${base}assets/`)) throw new Error(`not an assets URL: ${url}`);
    const name = url.slice(`${base}assets/`.length);
    if (!/^[\w.-]+$/.test(name)) throw new Error(`not an assets URL: ${url}`);
    return join(files, 'assets', name);
  }

  it('parses as well-formed XML with an OfficeApp root of type TaskPaneApp', () => {
    expect(doc.getElementsByTagName('parsererror')).toHaveLength(0);
    expect(app.localName).toBe('OfficeApp');
    expect(app.getAttribute('xsi:type')).toBe('TaskPaneApp');
  });

  it('lists the OfficeApp children in the schema order, with the required ones present', () => {
    const schemaOrder = [
      'Id', 'Version', 'ProviderName', 'DefaultLocale', 'DisplayName', 'Description', 'IconUrl',
      'HighResolutionIconUrl', 'SupportUrl', 'AppDomains', 'Hosts', 'Requirements', 'DefaultSettings', 'Permissions',
      'VersionOverrides',
    ];
    const optional = new Set(['AppDomains']);
    const children = Array.from(app.children).map((e) => e.localName);
    expect(children).toEqual(schemaOrder.filter((n) => !optional.has(n) || children.includes(n)));
  });

  it('has a GUID id, our provider and display name, Excel workbooks only, ExcelApi 1.7 and document read/write', () => {
    const text = (name: string): string | undefined => Array.from(app.children).find((e) => e.localName === name)?.textContent?.trim();
    const attr = (name: string): string | null | undefined => Array.from(app.children).find((e) => e.localName === name)?.getAttribute('DefaultValue');
    expect(text('Id')).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i);
    expect(text('ProviderName')).toBe('Longipane project');
    expect(attr('DisplayName')).toBe('Longipane');
    // The schema caps Description at 250 characters (manifest reference, Description element).
    expect((attr('Description') ?? '').length).toBeLessThanOrEqual(250);
    expect(Array.from(doc.querySelectorAll('OfficeApp > Hosts > Host')).map((h) => h.getAttribute('Name'))).toEqual(['Workbook']);
    const set = doc.querySelector('Requirements Sets Set');
    expect([set?.getAttribute('Name'), set?.getAttribute('MinVersion')]).toEqual(['ExcelApi', '1.7']);
    expect(text('Permissions')).toBe('ReadWriteDocument');
    expect(base).toMatch(/^https:\/\/[^/]+\/(.*\/)?$/);
    // The source points at the development server; the built one at the address it was built for.
    if (file.startsWith(dist)) expect(base).not.toMatch(/localhost/);
    else expect(base).toBe('https://localhost:3000/');
  });

  it('puts one button on the Home tab that shows the task pane', () => {
    const points = Array.from(doc.getElementsByTagName('ExtensionPoint'));
    expect(points.map((p) => p.getAttribute('xsi:type'))).toEqual(['PrimaryCommandSurface']);
    const tab = points[0]?.getElementsByTagName('OfficeTab')[0];
    expect(tab?.getAttribute('id')).toBe('TabHome');
    const controls = Array.from(doc.getElementsByTagName('Control'));
    expect(controls).toHaveLength(1);
    const action = controls[0]?.getElementsByTagName('Action')[0];
    expect(action?.getAttribute('xsi:type')).toBe('ShowTaskpane');
  });

  it('resolves every resid to a resource, with ids of at most 32 characters (manifest reference, Resources)', () => {
    const ids = new Set(Array.from(doc.querySelectorAll('Resources [id]')).map((e) => e.getAttribute('id') ?? ''));
    const used = Array.from(doc.querySelectorAll('[resid]')).map((e) => e.getAttribute('resid') ?? '');
    expect(used.length).toBeGreaterThan(0);
    for (const r of used) expect(ids, r).toContain(r);
    for (const id of ids) expect(id.length).toBeLessThanOrEqual(32);
  });

  it('uses https for every URL', () => {
    const urls = [...xml.matchAll(/(?:DefaultValue|Override Value)="([a-z]+:\/\/[^"]*)"/gi)].map((m) => m[1] ?? '');
    expect(urls.length).toBeGreaterThan(5);
    for (const u of urls) expect(u).toMatch(/^https:\/\//);
    // Only namespaces may use http://; no other http:// address appears.
    const plain = [...xml.matchAll(/http:\/\/[^"\s]+/g)].map((m) => m[0]).filter((u) => !u.startsWith('http://schemas.microsoft.com/') && u !== 'http://www.w3.org/2001/XMLSchema-instance');
    expect(plain).toEqual([]);
  });

  it('references icons that exist in assets/ at their declared pixel sizes', () => {
    const declared: { url: string; size: number }[] = [
      { url: doc.querySelector('OfficeApp > IconUrl')?.getAttribute('DefaultValue') ?? '', size: 32 },
      { url: doc.querySelector('OfficeApp > HighResolutionIconUrl')?.getAttribute('DefaultValue') ?? '', size: 64 },
    ];
    const images = new Map(Array.from(doc.querySelectorAll('Resources Images Image')).map((e) => [e.getAttribute('id'), e.getAttribute('DefaultValue') ?? '']));
    for (const img of Array.from(doc.querySelectorAll('Icon > Image'))) {
      declared.push({ url: images.get(img.getAttribute('resid')) ?? '', size: Number(img.getAttribute('size')) });
    }
    for (const { url, size } of declared) {
      const path = assetPath(url);
      expect(existsSync(path), path).toBe(true);
      expect(pngSize(path)).toEqual({ width: size, height: size });
    }
  });

  it('ships every icon file at the size its name states (16, 32, 64, 80, 128 px)', () => {
    const icons = readdirSync(join(files, 'assets')).filter((f) => f.endsWith('.png')).sort();
    expect(icons).toEqual(['icon-128.png', 'icon-16.png', 'icon-32.png', 'icon-64.png', 'icon-80.png']);
    for (const f of icons) {
      const n = Number(/icon-(\d+)\.png/.exec(f)?.[1]);
      expect(pngSize(join(files, 'assets', f))).toEqual({ width: n, height: n });
    }
  });

  it("is read without network by the platform tooling's own manifest reader", async () => {
    const info = await OfficeAddinManifest.readManifestFile(file);
    expect(info.id).toBe('21790eb3-f8fb-4cb2-8eb7-a6339bf428a9');
    expect(info.displayName).toBe('Longipane');
    expect(info.hosts).toEqual(['Workbook']);
    expect(info.permissions).toBe('ReadWriteDocument');
    expect(info.officeAppType).toBe('TaskPaneApp');
  });
});
