/**
 * manifest.xml checked offline: parsed with xml2js (the parser the Office toolchain's
 * office-addin-manifest uses), then the facts Excel relies on — the RATCHET namespace, the
 * SharedRuntime requirement and one runtime shared by the functions and the task pane, resource ids
 * that resolve, URLs on one origin that match the webpack outputs, and icons that exist.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../../', import.meta.url));
const requireFromManifestTool = createRequire(createRequire(import.meta.url).resolve('office-addin-manifest'));
const xml2js = requireFromManifestTool('xml2js') as { parseStringPromise(xml: string, options?: object): Promise<unknown> };

type Node = { [key: string]: Node[] | Node | string | undefined; $?: Record<string, string> } & Record<string, unknown>;
let doc: Node;
const text = readFileSync(`${root}manifest.xml`, 'utf8');

/** All elements named `name` anywhere below `node`. */
function all(node: unknown, name: string, out: Node[] = []): Node[] {
  if (Array.isArray(node)) for (const n of node) all(n, name, out);
  else if (node && typeof node === 'object') {
    for (const [k, v] of Object.entries(node as Record<string, unknown>)) {
      if (k === '$') continue;
      if (k === name) for (const n of v as Node[]) out.push(n);
      all(v, name, out);
    }
  }
  return out;
}

beforeAll(async () => {
  doc = (await xml2js.parseStringPromise(text, { explicitArray: true })) as Node;
});

describe('manifest.xml', () => {
  it('is a task pane add-in for Excel workbooks with an id and version', () => {
    const app = (doc as { OfficeApp: Node }).OfficeApp;
    expect(app.$?.['xsi:type']).toBe('TaskPaneApp');
    expect((app.Id as unknown as string[])[0]).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/);
    expect((app.Version as unknown as string[])[0]).toMatch(/^\d+\.\d+\.\d+\.\d+$/);
    expect(all(app.Hosts, 'Host').map((h) => h.$?.Name)).toEqual(['Workbook']);
  });

  it('requires the SharedRuntime 1.1 set and declares one long-lived runtime used by functions and pane', () => {
    const sets = all(doc, 'Set').map((s) => [s.$?.Name, s.$?.MinVersion]);
    expect(sets).toContainEqual(['SharedRuntime', '1.1']);
    const runtimes = all(doc, 'Runtime');
    expect(runtimes).toHaveLength(1);
    expect(runtimes[0]!.$).toEqual({ resid: 'Taskpane.Url', lifetime: 'long' });
    const cf = all(doc, 'ExtensionPoint').find((e) => e.$?.['xsi:type'] === 'CustomFunctions')!;
    expect(all(cf.Page, 'SourceLocation')[0]!.$?.resid).toBe('Taskpane.Url');
    const taskpaneAction = all(doc, 'Action').find((a) => a.$?.['xsi:type'] === 'ShowTaskpane')!;
    expect(all(taskpaneAction, 'SourceLocation')[0]!.$?.resid).toBe('Taskpane.Url');
    expect(all(doc, 'FunctionFile')[0]!.$?.resid).toBe('Taskpane.Url');
  });

  it('puts the functions in the namespace RATCHET', () => {
    const cf = all(doc, 'ExtensionPoint').find((e) => e.$?.['xsi:type'] === 'CustomFunctions')!;
    const resid = all(cf, 'Namespace')[0]!.$?.resid;
    const str = all(doc, 'bt:String').find((s) => s.$?.id === resid);
    expect(str?.$?.DefaultValue).toBe('RATCHET');
  });

  it('every resid resolves to exactly one resource, and every resource is used', () => {
    const defined = [...all(doc, 'bt:Image'), ...all(doc, 'bt:Url'), ...all(doc, 'bt:String')].map((r) => r.$?.id).filter((id): id is string => id !== undefined);
    expect(new Set(defined).size).toBe(defined.length);
    const used = [...text.matchAll(/resid="([^"]+)"/g)].map((m) => m[1]!);
    for (const id of used) expect(defined).toContain(id);
    for (const id of defined) expect(used).toContain(id);
  });

  it('URLs share one https origin, listed in AppDomains, and point at files the build writes', () => {
    const urls = [...text.matchAll(/DefaultValue="(https:[^"]+)"/g)].map((m) => new URL(m[1]!));
    const own = urls.filter((u) => u.host === 'localhost:3000');
    const domains = all(doc, 'AppDomain') as unknown as string[];
    expect(domains).toEqual(['https://localhost:3000']);
    const byId = Object.fromEntries(all(doc, 'bt:Url').map((u) => [u.$?.id, new URL(u.$!.DefaultValue!).pathname]));
    expect(byId).toMatchObject({ 'Functions.Script.Url': '/functions.js', 'Functions.Metadata.Url': '/functions.json', 'Taskpane.Url': '/taskpane.html' });
    const config = readFileSync(`${root}webpack.config.js`, 'utf8');
    expect(config).toContain("functions: './src/functions/functions.ts'");
    expect(config).toContain("output: 'functions.json'");
    expect(config).toContain("filename: 'taskpane.html'");
    expect(config).toContain("from: 'assets/*.png'");
    // Everything of ours is served from the dev server origin; only SupportUrl/LearnMore go elsewhere.
    expect(own.length).toBeGreaterThanOrEqual(9);
  });

  it('every icon exists as a PNG of the stated size', () => {
    const icons = [...all(doc, 'bt:Image'), ...all(doc, 'IconUrl'), ...all(doc, 'HighResolutionIconUrl')]
      .map((i) => i.$?.DefaultValue)
      .filter((u): u is string => u !== undefined);
    expect(icons.length).toBeGreaterThanOrEqual(5);
    for (const u of icons) {
      const path = new URL(u).pathname.replace(/^\//, '');
      expect(existsSync(`${root}${path}`), path).toBe(true);
      const png = readFileSync(`${root}${path}`);
      expect(png.subarray(1, 4).toString('ascii')).toBe('PNG');
      const size = Number(/icon-(\d+)\.png$/.exec(path)?.[1]);
      expect(png.readUInt32BE(16)).toBe(size); // IHDR width
      expect(png.readUInt32BE(20)).toBe(size); // IHDR height
    }
  });

  it('office-addin-manifest reads it (offline parse, no validation service)', async () => {
    const { OfficeAddinManifest } = (await import('office-addin-manifest')) as unknown as {
      OfficeAddinManifest: { readManifestFile(path: string): Promise<{ id?: string; displayName?: string; hosts?: string[] }> };
    };
    const info = await OfficeAddinManifest.readManifestFile(`${root}manifest.xml`);
    expect(info.displayName).toBe('Ratchet');
    expect(info.id).toBe('4bac03a3-5d42-4ff5-9569-33d9efe9b0a4');
    expect(info.hosts).toEqual(['Workbook']);
  });
});
