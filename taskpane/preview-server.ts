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

/** The request target's path, decoded; undefined when it is malformed (→ 400). O(length). */
export function requestPath(target: string | undefined): string | undefined {
  if (target === undefined || !target.startsWith('/') || target.startsWith('//')) return undefined;
  const raw = target.replace(/[?#].*$/s, '');
  let rel: string;
  try {
    rel = decodeURIComponent(raw);
  } catch {
    return undefined;
  }
  // No control characters, no backslashes (Windows separators), no "." or ".." segments.
  // eslint-disable-next-line no-control-regex
  if (/[\x00-\x1f\x7f\\]/.test(rel)) return undefined;
  if (rel.split('/').some((seg) => seg === '.' || seg === '..')) return undefined;
  return rel === '/' ? '/preview.html' : rel;
}

/** True when a Host header names this server: 127.0.0.1:PORT or localhost:PORT (DNS rebinding guard). */
export function hostAllowed(host: string | undefined, port: number): boolean {
  if (host === undefined) return false;
  const h = host.toLowerCase();
  return h === `127.0.0.1:${port}` || h === `localhost:${port}`;
}

/**
 * Serves `dir` on 127.0.0.1 (port 0 = any free port); "/" is preview.html. Only GET and HEAD;
 * only requests whose Host is `127.0.0.1:PORT` or `localhost:PORT` (403 otherwise, so a page
 * on another name that resolves to 127.0.0.1 cannot read the build); a malformed path (bad
 * percent escape, control character, backslash, "." or ".." segment, absolute form) is 400;
 * only regular files whose real path (links resolved) lies inside the real `dir` are served,
 * anything else is 404. No request can stop the server: a failure while answering is a 400 or
 * a closed connection, never an uncaught exception.
 */
export function startPreviewServer(dir: string, port = 0): Promise<PreviewServer> {
  const base = fs.realpathSync(path.resolve(dir));
  let bound = port;
  const answer = (res: http.ServerResponse, status: number, headers: Record<string, string>, text: string): void => {
    res.writeHead(status, { ...headers, 'Content-Type': 'text/plain; charset=utf-8' });
    res.end(text);
  };
  const handle = (req: http.IncomingMessage, res: http.ServerResponse): void => {
    const headers: Record<string, string> = { 'X-Content-Type-Options': 'nosniff', 'Cache-Control': 'no-store', 'Content-Security-Policy': PREVIEW_CSP };
    if (!hostAllowed(req.headers.host, bound)) return answer(res, 403, headers, 'forbidden host');
    if (req.method !== 'GET' && req.method !== 'HEAD') {
      res.writeHead(405, { ...headers, Allow: 'GET, HEAD' });
      res.end();
      return;
    }
    const rel = requestPath(req.url);
    if (rel === undefined) return answer(res, 400, headers, 'bad request');
    const file = path.resolve(base, `.${rel}`);
    let real: string;
    let fd: number;
    try {
      real = fs.realpathSync(file);
      if (!real.startsWith(base + path.sep)) return answer(res, 404, headers, 'not found');
      fd = fs.openSync(real, fs.constants.O_RDONLY | (fs.constants.O_NOFOLLOW ?? 0));
    } catch {
      return answer(res, 404, headers, 'not found');
    }
    let size: number;
    try {
      const st = fs.fstatSync(fd);
      if (!st.isFile()) {
        fs.closeSync(fd);
        return answer(res, 404, headers, 'not found');
      }
      size = st.size;
    } catch {
      fs.closeSync(fd);
      return answer(res, 404, headers, 'not found');
    }
    // The Office page (taskpane.html, when a build holds it) keeps its own meta policy, which admits office.js.
    if (path.basename(real) === 'taskpane.html') delete headers['Content-Security-Policy'];
    res.writeHead(200, { ...headers, 'Content-Type': TYPES[path.extname(real)] ?? 'application/octet-stream', 'Content-Length': String(size) });
    if (req.method === 'HEAD') {
      fs.closeSync(fd);
      res.end();
      return;
    }
    const stream = fs.createReadStream('', { fd });
    stream.on('error', () => res.destroy());
    stream.pipe(res);
  };
  const server = http.createServer((req, res) => {
    try {
      handle(req, res);
    } catch {
      if (!res.headersSent) answer(res, 400, {}, 'bad request');
      else res.destroy();
    }
  });
  server.on('clientError', (_err, socket) => {
    if (socket.writable) socket.end('HTTP/1.1 400 Bad Request\r\nConnection: close\r\n\r\n');
    else socket.destroy();
  });
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => {
      const addr = server.address();
      const p = typeof addr === 'object' && addr ? addr.port : port;
      bound = p;
      resolve({
        url: `http://127.0.0.1:${p}/`,
        port: p,
        close: () =>
          new Promise<void>((r) => {
            server.close(() => r());
            server.closeAllConnections();
          }),
      });
    });
  });
}

/**
 * Removes `dir` (recursively) when the process ends, however it ends: normal exit, an uncaught
 * error, or SIGINT / SIGTERM / SIGHUP (which then exit with 0). Removal runs once. O(files).
 * @param dir a folder the process created (the temporary build).
 * @param proc the process to watch (default: this one; tests pass a stand-in).
 * @example removeOnExit('/tmp/ratchet-preview-x') // the folder is gone after the process exits
 */
export function removeOnExit(dir: string, proc: Pick<NodeJS.Process, 'once' | 'exit'> = process): void {
  let done = false;
  const remove = (): void => {
    if (done) return;
    done = true;
    fs.rmSync(dir, { recursive: true, force: true });
  };
  proc.once('exit', remove);
  for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
    proc.once(signal, () => {
      remove();
      proc.exit(0);
    });
  }
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
    // The build lives in a temporary folder: removed however the process ends (a failed build too).
    const built = fs.mkdtempSync(path.join(os.tmpdir(), 'ratchet-preview-'));
    removeOnExit(built);
    dir = await buildPreview(built);
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
