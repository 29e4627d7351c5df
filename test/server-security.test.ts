// The loopback server's guards: loopback only, Host and Origin checked, a token on every API call,
// payloads checked before anything runs, no files outside the renderer folder. Run against the
// invented demo field (src/main/services/demo.ts) in a temporary field log.
import { mkdirSync, writeFileSync } from 'node:fs';
import { request } from 'node:http';
import { networkInterfaces } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, type FieldDb } from '../src/main/db/database.js';
import { startLoopbackServer, type LoopbackServer } from '../src/main/server/index.js';
import { createServices, type Services } from '../src/main/services/index.js';
import { CHANNELS, SERVICE_METHODS, channelOf, toWire } from '../src/shared/contract/channels.js';
import { createClient, fetchTransport } from '../src/shared/contract/client.js';
import { InputError } from '../src/shared/errors.js';
import { tempDir } from './db-helpers.js';

interface Reply {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  text: string;
  json: any; // eslint-disable-line @typescript-eslint/no-explicit-any
}

/** One request with the path exactly as given (node's http does not normalise `..` the way fetch does). */
function raw(server: { port: number }, path: string, options: { method?: string; headers?: Record<string, string>; body?: string } = {}): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port: server.port, path, method: options.method ?? 'GET', headers: options.headers ?? {} }, (res) => {
      let text = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => (text += c));
      res.on('end', () => {
        let json: unknown;
        try {
          json = JSON.parse(text);
        } catch {
          json = undefined;
        }
        resolve({ status: res.statusCode ?? 0, headers: res.headers, text, json });
      });
    });
    req.on('error', reject);
    req.end(options.body);
  });
}

let dir: string;
let fdb: FieldDb;
let services: Services;
let server: LoopbackServer;
const logged: string[] = [];

function api(method: string, body: unknown, headers: Record<string, string> = {}): Promise<Reply> {
  return raw(server, `/api/${method}`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${server.token}`, ...headers },
    body: typeof body === 'string' ? body : JSON.stringify(body),
  });
}

const countReadings = (): number => (fdb.db.prepare('SELECT count(*) AS n FROM readings').get() as { n: number }).n;

beforeAll(async () => {
  dir = tempDir();
  fdb = openDatabase(join(dir, 'demo.sqlite'));
  services = createServices(fdb, { who: 'tester' });
  services.buildDemo();
  // A renderer folder with a secret beside it, for the traversal probes.
  mkdirSync(join(dir, 'site', 'assets'), { recursive: true });
  writeFileSync(join(dir, 'site', 'index.html'), '<!doctype html><title>t</title>');
  writeFileSync(join(dir, 'site', 'assets', 'app.js'), 'export {};\n');
  writeFileSync(join(dir, 'site', '.hidden'), 'hidden');
  writeFileSync(join(dir, 'secret.txt'), 'SECRET');
  server = await startLoopbackServer({ services, port: 0, staticDir: join(dir, 'site'), log: (t) => logged.push(t) });
});

afterAll(async () => {
  await server?.close();
  fdb?.close();
});

describe('where the server listens', () => {
  it('binds 127.0.0.1 only, on the port it reports', () => {
    const address = server.address();
    expect(address.address).toBe('127.0.0.1'); // the IPv4 loopback address (RFC 1122 §3.2.1.3)
    expect(address.family).toBe('IPv4');
    expect(address.port).toBe(server.port);
    expect(server.url).toBe(`http://127.0.0.1:${server.port}/`);
  });

  it('is not reachable on any other address of this machine', async () => {
    // Every address of this machine's interfaces except 127.0.0.1 itself (IPv6 link-local ones need a
    // zone to be dialled and are left out), the IPv6 loopback ::1 among them.
    const others = Object.values(networkInterfaces()).flat()
      .filter((i) => i !== undefined && i.address !== '127.0.0.1' && !i.address.startsWith('fe80:'))
      .map((i) => i!.address);
    for (const address of others) {
      const outcome = await new Promise<string>((resolve) => {
        const req = request({ host: address, port: server.port, path: '/', timeout: 2000 }, () => resolve('answered'));
        req.on('error', (e: NodeJS.ErrnoException) => resolve(e.code ?? 'error'));
        req.on('timeout', () => {
          req.destroy();
          resolve('timeout');
        });
        req.end();
      });
      expect(outcome, `address ${address}`).not.toBe('answered');
    }
  });

  it('makes a new 32-byte token at every launch', async () => {
    expect(server.token).toMatch(/^[0-9a-f]{64}$/); // 32 bytes = 64 hex digits
    const second = await startLoopbackServer({ services, port: 0, staticDir: join(dir, 'site') });
    try {
      expect(second.token).not.toBe(server.token);
      expect(second.port).not.toBe(server.port);
    } finally {
      await second.close();
    }
  });
});

describe('the token', () => {
  it('is required: no token → 401', async () => {
    const r = await raw(server, '/api/listWells', { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: '{}' });
    expect(r.status).toBe(401);
    expect(r.json.error).toMatch(/token/);
    expect(r.headers['www-authenticate']).toBe('Bearer');
  });

  it('must be right: a wrong one → 401, in either header', async () => {
    const wrong = server.token.slice(0, -1) + (server.token.endsWith('0') ? '1' : '0'); // one digit off
    for (const headers of <Record<string, string>[]>[{ Authorization: `Bearer ${wrong}` }, { Authorization: `Bearer ${server.token}x` }, { Authorization: server.token }, { 'X-Tauwell-Token': wrong }]) {
      const r = await raw(server, '/api/listWells', { method: 'POST', headers: { 'Content-Type': 'application/json', ...headers }, body: '{}' });
      expect(r.status, JSON.stringify(headers)).toBe(401);
    }
  });

  it('is accepted as Authorization: Bearer or X-Tauwell-Token', async () => {
    expect((await api('listWells', {})).status).toBe(200);
    const r = await raw(server, '/api/listWells', { method: 'POST', headers: { 'Content-Type': 'application/json', 'X-Tauwell-Token': server.token }, body: '{}' });
    expect(r.status).toBe(200);
  });
});

describe('Host and Origin', () => {
  it('refuses a Host that is not this server on loopback → 403 (DNS rebinding)', async () => {
    for (const host of ['evil.example', `evil.example:${server.port}`, `127.0.0.1:${server.port + 1}`, `192.168.1.10:${server.port}`, `[::1]:${server.port}`]) {
      const r = await api('listWells', {}, { Host: host });
      expect(r.status, host).toBe(403);
      expect((await raw(server, '/', { headers: { Host: host } })).status, `GET / with ${host}`).toBe(403);
    }
    expect((await api('listWells', {}, { Host: `localhost:${server.port}` })).status).toBe(200);
  });

  it('refuses an Origin that is present and not this server → 403', async () => {
    for (const origin of ['https://evil.example', 'null', `http://127.0.0.1:${server.port + 1}`, `https://127.0.0.1:${server.port}`, `http://localhost.evil.example:${server.port}`]) {
      const r = await api('listWells', {}, { Origin: origin });
      expect(r.status, origin).toBe(403);
    }
    expect((await api('listWells', {}, { Origin: `http://127.0.0.1:${server.port}` })).status).toBe(200);
    expect((await api('listWells', {}, { Origin: `http://localhost:${server.port}` })).status).toBe(200);
  });
});

describe('requests the API refuses', () => {
  it('malformed JSON → 400 with a clear message', async () => {
    const r = await api('listWells', '{"field": ');
    expect(r.status).toBe(400);
    expect(r.json.error).toMatch(/^the request body is not valid JSON: /);
    expect(r.json.error).not.toMatch(/\n/);
    const empty = await api('listWells', '');
    expect(empty.status).toBe(400);
    expect(empty.json.error).toMatch(/empty/);
  });

  it('a payload its schema refuses → 400 naming the field, and nothing written', async () => {
    const before = countReadings();
    const auditBefore = services.auditLog({}).entries.length;
    const r = await api('logReading', { well: 'KR-1', time: '2030-01-01T00:00:00Z', productionTemperature: '150' });
    expect(r.status).toBe(400);
    expect(r.json.field).toBe('productionTemperature');
    expect(r.json.error).toBe('field "productionTemperature": must be a finite number (got "150")');
    expect(countReadings()).toBe(before);
    expect(services.auditLog({}).entries.length).toBe(auditBefore);
  });

  it('an InputError from a service → 400 with its message', async () => {
    const r = await api('getWell', { well: 'NO-SUCH-WELL' });
    expect(r.status).toBe(400);
    expect(r.json).toEqual({ error: 'field "well": no well named "NO-SUCH-WELL" in the field log', reason: 'no well named "NO-SUCH-WELL" in the field log', field: 'well' });
  });

  it('an unknown method → 404, including names every object has', async () => {
    for (const name of ['dropDatabase', '__proto__', 'constructor', 'toString', 'hasOwnProperty', '', 'listWells/../buildDemo', 'listwells']) {
      expect((await api(name, {})).status, name).toBe(404);
    }
  });

  it('a body over the size limit → 413; not JSON → 415; not POST → 405', async () => {
    expect((await api('listWells', JSON.stringify({ field: 'x'.repeat(1024 * 1024 + 1) }))).status).toBe(413);
    expect((await api('listWells', '{}', { 'Content-Type': 'text/plain' })).status).toBe(415);
    const get = await raw(server, '/api/listWells', { headers: { Authorization: `Bearer ${server.token}` } });
    expect(get.status).toBe(405);
    expect(get.headers.allow).toBe('POST');
  });

  it('anything else → 500 with a generic message; the stack goes to the log only', async () => {
    const broken = { ...services, listWells: () => { throw new Error('secret detail of a bug'); } };
    const lines: string[] = [];
    const other = await startLoopbackServer({ services: broken, port: 0, staticDir: join(dir, 'site'), log: (t) => lines.push(t) });
    try {
      const r = await raw(other, '/api/listWells', { method: 'POST', headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${other.token}` }, body: '{}' });
      expect(r.status).toBe(500);
      expect(r.text).not.toMatch(/secret detail|at .*\.ts/);
      expect(r.json.error).toMatch(/internal error/);
      expect(lines.join('')).toMatch(/listWells: Error: secret detail of a bug\n\s+at /);
    } finally {
      await other.close();
    }
  });
});

describe('what the API exposes', () => {
  it('the channels are exactly the service methods', () => {
    const methods = Object.keys(services).sort();
    expect([...SERVICE_METHODS]).toEqual(methods);
    expect([...CHANNELS]).toEqual(methods.map((m) => `tauwell:${m}`));
  });

  it('every channel is served, and each checks its payload before running', async () => {
    const before = countReadings();
    for (const method of SERVICE_METHODS) {
      const r = await api(method, '"not an object"');
      expect(r.status, method).toBe(400);
      expect(r.json.error, method).toBe('must be an object (got string)');
    }
    expect(countReadings()).toBe(before);
  });

  it('a good call returns the same data as calling the service directly', async () => {
    const wells = await api('listWells', {});
    expect(wells.status).toBe(200);
    expect(wells.json).toEqual(toWire(services.listWells({})));
    const readings = await api('listReadings', { well: 'KR-1', from: '2020-01-01T00:00:00Z', to: '2021-01-01T00:00:00Z' });
    expect(readings.json).toEqual(toWire(services.listReadings({ well: 'KR-1', from: '2020-01-01T00:00:00Z', to: '2021-01-01T00:00:00Z' })));
  });

  it('a fit crosses as JSON: typed arrays as lists, non-finite numbers as null', async () => {
    const request = { well: 'KR-3', basis: 'mass', model: 'exponential' } as const;
    const r = await api('fitWell', request);
    expect(r.status).toBe(200);
    const direct = services.fitWell(request);
    expect(ArrayBuffer.isView(direct.fit.residuals)).toBe(true);
    expect(Array.isArray(r.json.fit.residuals)).toBe(true);
    expect(r.json.fit.residuals).toHaveLength(direct.fit.residuals.length);
    // Two fits differ only in their stored record (id and time); everything else is the same data.
    const { stored: _a, ...overHttp } = r.json;
    const { stored: _b, ...directly } = toWire(direct) as Record<string, unknown>;
    expect(overHttp).toEqual(directly);
  });

  it('the typed client over fetch reaches the same data, and rethrows InputError', async () => {
    const client = createClient(fetchTransport(fetch, { token: server.token, base: server.url }));
    expect(await client.listWells()).toEqual(toWire(services.listWells({})));
    const e = await client.getWell({ well: 'NO-SUCH-WELL' }).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(InputError);
    expect((e as InputError).where.field).toBe('well');
    const refused = await createClient(fetchTransport(fetch, { token: 'wrong', base: server.url })).listWells().catch((x: unknown) => x);
    expect(refused).toMatchObject({ name: 'CallError', kind: 'refused', status: 401 });
    expect(channelOf('listWells')).toBe('tauwell:listWells');
  });

  it('API responses are data only: JSON, no caching, no Referer, a CSP that loads nothing', async () => {
    const r = await api('listWells', {});
    expect(r.headers['content-type']).toBe('application/json; charset=utf-8');
    expect(r.headers['cache-control']).toBe('no-store');
    expect(r.headers['referrer-policy']).toBe('no-referrer');
    expect(r.headers['x-content-type-options']).toBe('nosniff');
    expect(r.headers['content-security-policy']).toBe("default-src 'none'; frame-ancestors 'none'");
  });
});

describe('static files', () => {
  it('serves the renderer with a strict CSP', async () => {
    const page = await raw(server, '/');
    expect(page.status).toBe(200);
    expect(page.text).toBe('<!doctype html><title>t</title>');
    expect(page.headers['content-type']).toBe('text/html; charset=utf-8');
    const csp = String(page.headers['content-security-policy']);
    for (const directive of ["default-src 'self'", "script-src 'self'", "object-src 'none'", "frame-ancestors 'none'", "base-uri 'none'"]) expect(csp).toContain(directive);
    expect(csp).not.toMatch(/unsafe-inline|unsafe-eval|\*/);
    const script = await raw(server, '/assets/app.js');
    expect(script.status).toBe(200);
    expect(script.headers['content-type']).toBe('text/javascript; charset=utf-8');
  });

  it.each([
    '/../package.json', '/%2e%2e/package.json', '/%2E%2E/package.json', '/..%2fpackage.json', '/%2e%2e%2fpackage.json',
    '/../secret.txt', '/%2e%2e/secret.txt', '/assets/../../secret.txt', '/assets/%2e%2e/%2e%2e/secret.txt', '/..%5csecret.txt',
    '/..\\secret.txt', '//secret.txt', '/%00/secret.txt', '/.hidden', '/assets/', '/assets', '/nothing.html', '/%E0%A4%A',
  ])('GET %s → 404 (no traversal, no listing)', async (path) => {
    const r = await raw(server, path);
    expect(r.status).toBe(404);
    expect(r.text).not.toMatch(/SECRET|hidden|"name": "tauwell"/);
  });

  it('only GET and HEAD', async () => {
    expect((await raw(server, '/', { method: 'POST', body: '' })).status).toBe(405);
    const head = await raw(server, '/', { method: 'HEAD' });
    expect(head.status).toBe(200);
    expect(head.text).toBe('');
  });

  it('without a built renderer, / says how to build it', async () => {
    const bare = await startLoopbackServer({ services, port: 0, staticDir: join(dir, 'no-such-folder') });
    try {
      const r = await raw(bare, '/');
      expect(r.status).toBe(200);
      expect(r.text).toMatch(/not built/);
      expect(r.text).toMatch(/electron-vite build/);
      expect(r.text).not.toMatch(/<script|<style|style=/);
      expect(r.headers['content-security-policy']).toMatch(/script-src 'self'/);
      expect((await raw(bare, '/assets/app.js')).status).toBe(404);
    } finally {
      await bare.close();
    }
  });
});
