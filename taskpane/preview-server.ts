/**
 * `npm run preview`: builds the pane with the project's webpack config (development mode, no
 * eval-based source maps) into a temporary folder and serves it on http://127.0.0.1:<port>/ —
 * bound to the loopback interface only. The page is the browser preview (preview.html); it never
 * loads office.js and sends nothing anywhere.
 *
 *   npm run preview                     # port 3100
 *   npm run preview -- --port 8080
 *   npm run preview -- --dir dist       # serve an existing build instead of building
 *
 * The end-to-end tests import {@link buildPreview} and {@link startPreviewServer}.
 */
import http from 'node:http';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(here, '..');

/** Content-Security-Policy sent with every response (the page also carries it as a meta tag). */
export const PREVIEW_CSP =
  "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self' data: blob:; font-src 'self'; connect-src 'self'; worker-src 'self'; object-src 'none'; base-uri 'none'; form-action 'none'; frame-src 'none'; frame-ancestors 'none'";

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.png': 'image/png',
  '.svg': 'image/svg+xml',
  '.xml': 'application/xml; charset=utf-8',
  '.xlsx': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
  '.txt': 'text/plain; charset=utf-8',
};

/**
 * Builds the preview into `outDir` (a fresh temporary folder by default) with the project's
 * webpack config restricted to the preview entry (the custom-functions metadata and the Office
 * page are not needed; `pages` adds the Office page for tests). `fast` (tests) skips source maps and type checking — `npm run typecheck`
 * does that.
 */
export async function buildPreview(outDir = fs.mkdtempSync(path.join(os.tmpdir(), 'ratchet-preview-')), fast = false, pages: readonly ('preview' | 'taskpane')[] = ['preview']): Promise<string> {
  const { default: webpack } = await import('webpack');
  const configModule = (await import(pathToFileURL(path.join(root, 'webpack.config.js')).href)) as { default: (env: object, argv: object) => Promise<import('webpack').Configuration> };
  const config = await configModule.default({}, { mode: 'development' });
  const entry = config.entry as Record<string, string>;
  config.entry = Object.fromEntries(pages.map((p) => [p, entry[p]!]));
  config.plugins = (config.plugins ?? []).filter((p) => {
    const name = p?.constructor?.name;
    if (name === 'CustomFunctionsMetadataPlugin') return false;
    const filename = (p as { userOptions?: { filename?: string } }).userOptions?.filename;
    return !(name === 'HtmlWebpackPlugin' && !pages.some((q) => filename === `${q}.html`));
  });
  if (fast) {
    config.devtool = false;
    for (const rule of config.module?.rules ?? []) {
      const use = (rule as { use?: { loader?: string; options?: Record<string, unknown> } }).use;
      if (use?.loader === 'ts-loader') use.options = { ...use.options, transpileOnly: true };
    }
  }
  config.output = { ...config.output, path: outDir };
  config.infrastructureLogging = { level: 'error' };
  await new Promise<void>((resolve, reject) => {
    webpack(config, (err, stats) => {
      if (err) return reject(err);
      if (stats?.hasErrors()) return reject(new Error(stats.toString({ all: false, errors: true, errorDetails: true })));
      resolve();
    });
  });
  return outDir;
}

/** A running preview server. */
export interface PreviewServer {
  readonly url: string;
  readonly port: number;
  close(): Promise<void>;
}

/** Serves `dir` on 127.0.0.1 (port 0 = any free port); "/" is preview.html. */
export function startPreviewServer(dir: string, port = 0): Promise<PreviewServer> {
  const base = path.resolve(dir);
  const server = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://127.0.0.1');
    let rel = decodeURIComponent(url.pathname);
    if (rel === '/' || rel === '') rel = '/preview.html';
    const file = path.resolve(base, `.${rel}`);
    // The Office page (taskpane.html, when a build holds it) keeps its own meta policy, which admits office.js.
    const headers: Record<string, string> = { 'X-Content-Type-Options': 'nosniff', 'Cache-Control': 'no-store' };
    if (path.basename(file) !== 'taskpane.html') headers['Content-Security-Policy'] = PREVIEW_CSP;
    if (!file.startsWith(base + path.sep) || !fs.existsSync(file) || !fs.statSync(file).isFile()) {
      res.writeHead(404, { ...headers, 'Content-Type': 'text/plain; charset=utf-8' });
      res.end('not found');
      return;
    }
    if (req.method !== 'GET' && req.method !== 'HEAD') {
      res.writeHead(405, headers);
      res.end();
      return;
    }
    res.writeHead(200, { ...headers, 'Content-Type': TYPES[path.extname(file)] ?? 'application/octet-stream' });
    if (req.method === 'HEAD') res.end();
    else fs.createReadStream(file).pipe(res);
  });
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => {
      const addr = server.address();
      const p = typeof addr === 'object' && addr ? addr.port : port;
      resolve({
        url: `http://127.0.0.1:${p}/`,
        port: p,
        close: () => new Promise<void>((r) => server.close(() => r())),
      });
    });
  });
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const opt = (name: string): string | undefined => {
    const i = args.indexOf(name);
    return i >= 0 ? args[i + 1] : undefined;
  };
  const port = Number(opt('--port') ?? process.env.RATCHET_PREVIEW_PORT ?? 3100);
  let dir = opt('--dir');
  if (dir === undefined) {
    process.stdout.write('Building the preview…\n');
    const built = await buildPreview();
    dir = built;
    // The build lives in a temporary folder: remove it when the server stops.
    for (const signal of ['SIGINT', 'SIGTERM'] as const) {
      process.once(signal, () => {
        fs.rmSync(built, { recursive: true, force: true });
        process.exit(0);
      });
    }
  }
  const s = await startPreviewServer(dir, port);
  process.stdout.write(`Ratchet preview: ${s.url}  (serving ${dir}; Ctrl+C to stop)\n`);
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((e: unknown) => {
    process.stderr.write(`${e instanceof Error ? e.message : String(e)}\n`);
    process.exit(1);
  });
}
