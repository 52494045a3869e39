/**
 * The preview server (`npm run preview`) on a temporary folder, no build needed: malformed paths
 * are 400 (a bad percent escape used to throw an uncaught URIError), only regular files whose
 * real path lies inside the served folder are served (links out are 404), only Host
 * 127.0.0.1:PORT or localhost:PORT is answered (DNS rebinding: 403 otherwise), and a fuzz of
 * 1,200 malformed requests (fast-check, fixed seed) gets a 4xx for every one and leaves the
 * server serving. The temporary folder is removed however the process ends. Expected statuses
 * follow HTTP semantics (RFC 9110: 400 malformed, 403 refused, 404 not found, 405 method)
 * (common practice).
 */
import { execFile } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { requestPath, startPreviewServer, type PreviewServer } from '../../taskpane/preview-server.js';

const ROOT = path.resolve(import.meta.dirname, '../..');
const TSX = path.join(ROOT, 'node_modules', '.bin', 'tsx');

let server: PreviewServer;
let dir: string;
let outside: string;

/** One raw HTTP/1.1 request over a fresh loopback socket; resolves with the status code (0 if none). */
function raw(request: string): Promise<number> {
  return new Promise((resolve) => {
    const socket = net.connect(server.port, '127.0.0.1');
    let data = '';
    const done = () => {
      const m = /^HTTP\/1\.[01] (\d{3})/.exec(data);
      resolve(m ? Number(m[1]) : 0);
    };
    socket.setTimeout(5000, () => socket.destroy());
    socket.on('data', (d) => {
      data += d.toString('latin1');
      if (/^HTTP\/1\.[01] \d{3}/.test(data)) socket.destroy();
    });
    socket.on('close', done);
    socket.on('error', () => undefined);
    socket.write(request);
  });
}

const get = (target: string, host = `127.0.0.1:${server.port}`, method = 'GET') => raw(`${method} ${target} HTTP/1.1\r\nHost: ${host}\r\nConnection: close\r\n\r\n`);

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'ratchet-serve-'));
  outside = fs.mkdtempSync(path.join(os.tmpdir(), 'ratchet-outside-'));
  fs.writeFileSync(path.join(dir, 'preview.html'), '<!doctype html><title>p</title>');
  fs.writeFileSync(path.join(dir, 'app.js'), 'export {};');
  fs.mkdirSync(path.join(dir, 'sub'));
  fs.writeFileSync(path.join(outside, 'secret.txt'), 'secret');
  fs.symlinkSync(path.join(outside, 'secret.txt'), path.join(dir, 'leak.txt'));
  fs.symlinkSync(outside, path.join(dir, 'out-folder'));
  fs.symlinkSync(path.join(dir, 'app.js'), path.join(dir, 'inner-link.js'));
  server = await startPreviewServer(dir);
});

afterAll(async () => {
  await server.close();
  fs.rmSync(dir, { recursive: true, force: true });
  fs.rmSync(outside, { recursive: true, force: true });
});

describe('preview server', () => {
  it('serves "/" and files of the folder to Host 127.0.0.1:PORT and localhost:PORT', async () => {
    expect(await get('/')).toBe(200);
    expect(await get('/app.js', `localhost:${server.port}`)).toBe(200);
    expect(await get('/app.js?v=1', `LOCALHOST:${server.port}`)).toBe(200);
    expect(await get('/app.js', `127.0.0.1:${server.port}`, 'HEAD')).toBe(200);
  });

  it('answers GET /% and other bad percent escapes with 400 and keeps serving', async () => {
    expect(await get('/%')).toBe(400);
    expect(await get('/%E0%A4%A')).toBe(400);
    expect(await get('/%ZZ')).toBe(400);
    expect(await get('/')).toBe(200);
  });

  it('refuses other Host headers with 403 (DNS rebinding) and a missing Host too', async () => {
    expect(await get('/', `evil.example:${server.port}`)).toBe(403);
    expect(await get('/', '127.0.0.1')).toBe(403);
    expect(await get('/', `127.0.0.1:${server.port + 1}`)).toBe(403);
    expect(await raw('GET / HTTP/1.0\r\n\r\n')).toBe(403);
  });

  it('serves no file whose real path lies outside the folder, no folder, and no traversal', async () => {
    expect(await get('/leak.txt')).toBe(404);
    expect(await get('/out-folder/secret.txt')).toBe(404);
    expect(await get('/sub')).toBe(404);
    expect(await get('/missing.js')).toBe(404);
    expect(await get('/../' + path.basename(outside) + '/secret.txt')).toBe(400);
    expect(await get('/%2e%2e/' + path.basename(outside) + '/secret.txt')).toBe(400);
    expect(await get('/inner-link.js')).toBe(200);
  });

  it('refuses methods other than GET and HEAD with 405', async () => {
    expect(await get('/', `127.0.0.1:${server.port}`, 'POST')).toBe(405);
    expect(await get('/', `127.0.0.1:${server.port}`, 'DELETE')).toBe(405);
  });

  it('requestPath decodes good paths and rejects malformed ones', () => {
    expect(requestPath('/')).toBe('/preview.html');
    expect(requestPath('/a%20b.js?x#y')).toBe('/a b.js');
    for (const bad of ['/%', 'app.js', '//evil/x', '/a\\b', '/%00', '/a/../b', '/./a', undefined]) expect(requestPath(bad)).toBeUndefined();
  });

  it('a fuzz of 1,200 malformed requests gets a 4xx for each and leaves the server serving', async () => {
    const hex = fc.constantFrom(...'0123456789abcdefABCDEFgz%');
    const badEscape = fc.tuple(fc.string({ maxLength: 6 }).map(encodeURIComponent), fc.array(hex, { maxLength: 2 }).map((h) => `%${h.join('')}`)).map(([a, b]) => `/${a}${b}`);
    const traversal = fc.constantFrom('/..', '/../', '/%2e%2e/', '/.%2e/', '/a/..%2f..%2f', '/%5c..%5c', '/./', '/%00', '/a%0d%0a');
    const symlinkOut = fc.constantFrom('/leak.txt', '/out-folder/secret.txt', '/out-folder/', '/sub', '/nope');
    const unit = fc.oneof(
      badEscape.map((t) => ({ t, host: 'ok' })),
      traversal.map((t) => ({ t, host: 'ok' })),
      symlinkOut.map((t) => ({ t, host: 'ok' })),
      fc.constantFrom('/', '/app.js').map((t) => ({ t, host: 'bad' })),
      fc.constantFrom('*', 'http://evil/', 'app.js', '//x/y').map((t) => ({ t, host: 'ok' })),
    );
    const cases = fc.sample(unit, { numRuns: 1200, seed: 20261201 });
    const statuses: number[] = [];
    for (let i = 0; i < cases.length; i += 24) {
      const chunk = cases.slice(i, i + 24);
      statuses.push(...(await Promise.all(chunk.map((c, j) => get(c.t, c.host === 'ok' ? `127.0.0.1:${server.port}` : `rebind${j}.example:${server.port}`)))));
    }
    expect(statuses).toHaveLength(1200);
    const wrong = statuses.map((s, i) => [s, cases[i]!.t] as const).filter(([s]) => s < 400 || s > 499);
    expect(wrong).toEqual([]);
    expect(await get('/')).toBe(200);
  }, 60000);
});

describe('removeOnExit', () => {
  it('removes the folder on a normal exit, an uncaught error and SIGTERM', async () => {
    const run = promisify(execFile);
    const mod = path.join(ROOT, 'taskpane', 'preview-server.ts');
    for (const ending of ['process.exit(3)', 'throw new Error("boom")', 'process.kill(process.pid, "SIGTERM"); setTimeout(() => {}, 5000)']) {
      const d = fs.mkdtempSync(path.join(os.tmpdir(), 'ratchet-exit-'));
      fs.writeFileSync(path.join(d, 'f.js'), 'x');
      const script = `import { removeOnExit } from ${JSON.stringify(mod)}; removeOnExit(${JSON.stringify(d)}); ${ending};`;
      await run(TSX, ['--eval', script], { cwd: ROOT }).catch(() => undefined);
      expect(fs.existsSync(d)).toBe(false);
    }
  }, 60000);
});
