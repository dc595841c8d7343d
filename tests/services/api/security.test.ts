import { join } from 'node:path';
import { createSqliteStore, type SqliteStore } from '@thermargin/store';
import { createScenario } from '@thermargin/simulator';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tempDir } from '../ingester/support.ts';
import { type ApiStack, startApiStack, TOKENS } from './stack.ts';

const scenario = createScenario({ vehicles: 1, days: 2, seed: 7 });
const ID = scenario.fleet.vehicles[0]!.id;
const dir = tempDir('api-security');
let samples: SqliteStore;
let stack: ApiStack;
let alertId = '';

beforeAll(async () => {
  samples = createSqliteStore({ path: join(dir, 'samples.db'), synchronous: 'normal' });
  await samples.writeSamples([...scenario.vehicleSamples(ID)]);
  stack = await startApiStack(dir, scenario.fleet, samples, () => scenario.history.to_ms + 3_600_000);
  await stack.analyzer.runOnce();
  const v = (await (await stack.get(`/api/vehicles/${ID}`)).json()) as { alerts: { id: string }[] };
  alertId = v.alerts[0]?.id ?? 'none';
}, 60_000);
afterAll(async () => {
  await stack?.close();
  await samples?.close();
});

/** Every write route, the least role it needs, and a valid body. */
const WRITES = () =>
  [
    {
      method: 'POST',
      path: `/api/vehicles/${ID}/alerts/${alertId}/acknowledge`,
      role: 'engineer',
      body: { note: 'seen' },
    },
    {
      method: 'POST',
      path: `/api/vehicles/${ID}/alerts/${alertId}/close`,
      role: 'engineer',
      body: { note: 'done' },
    },
    {
      method: 'POST',
      path: `/api/vehicles/${ID}/maintenance`,
      role: 'engineer',
      body: { date: '2026-07-30', action: 'fan_repaired' },
    },
    { method: 'POST', path: '/api/fleet/reload', role: 'admin', body: {} },
    { method: 'PUT', path: '/api/fleet', role: 'admin', body: scenario.fleet },
    { method: 'POST', path: '/api/tokens', role: 'admin', body: { name: 'new-one', role: 'viewer' } },
    { method: 'DELETE', path: '/api/tokens/new-one', role: 'admin', body: {} },
  ] as const;

const auditCount = async () =>
  ((await (await stack.get('/api/audit?limit=1000', 'admin')).json()) as { entries: unknown[] }).entries
    .length;

describe('API security', () => {
  it('every write route: 401 without a token, 401 with a wrong one, 403 with too low a role; nothing changes', async () => {
    const before = await auditCount();
    for (const w of WRITES()) {
      expect((await stack.send(w.method, w.path, w.body)).status, `${w.method} ${w.path}`).toBe(401);
      const bad = await fetch(`${stack.url}${w.path}`, {
        method: w.method,
        headers: { authorization: 'Bearer not-a-token', 'content-type': 'application/json' },
        body: JSON.stringify(w.body),
      });
      expect(bad.status).toBe(401);
      const lower = w.role === 'admin' ? (['viewer', 'engineer'] as const) : (['viewer'] as const);
      for (const role of lower) {
        const r = await stack.send(w.method, w.path, w.body, role);
        expect(r.status, `${w.method} ${w.path} as ${role}`).toBe(403);
        expect(((await r.json()) as { error: { code: string } }).error.code).toBe('forbidden');
      }
    }
    expect(await auditCount()).toBe(before);
  });

  it('every write route works with its role and is audited with who', async () => {
    for (const w of WRITES()) {
      if (alertId === 'none' && w.path.includes('/alerts/')) continue;
      const r = await stack.send(w.method, w.path, w.body, w.role);
      expect(r.status, `${w.method} ${w.path}: ${await r.clone().text()}`).toBe(200);
    }
    const audit = (await (await stack.get('/api/audit', 'admin')).json()) as {
      entries: { action: string; by: string }[];
    };
    expect(audit.entries.map((e) => e.action)).toEqual(
      expect.arrayContaining([
        'maintenance.add',
        'fleet.reload',
        'fleet.replace',
        'token.add',
        'token.remove',
      ]),
    );
    expect(audit.entries.find((e) => e.action === 'token.add')!.by).toBe('admin-user');
  });

  it('reads need a viewer token; health and the OpenAPI document do not', async () => {
    expect((await stack.get('/api/fleet', null)).status).toBe(401);
    expect((await stack.get('/api/health', null)).status).toBe(200);
    expect((await stack.get('/api/openapi.json', null)).status).toBe(200);
  });

  it('bad requests: malformed JSON, wrong types, unknown fields, huge bodies → 4xx naming the field; nothing stored', async () => {
    const before = await auditCount();
    const path = `/api/vehicles/${ID}/maintenance`;
    const malformed = await stack.send('POST', path, '{"date": "2026-07-30", ', 'engineer', true);
    expect(malformed.status).toBe(400);
    const wrong = await stack.send('POST', path, { date: 20260730, action: 'polished' }, 'engineer');
    expect(wrong.status).toBe(400);
    const problems = ((await wrong.json()) as { error: { problems: { where: string; rule: string }[] } })
      .error.problems;
    expect(problems.map((p) => p.where)).toEqual(expect.arrayContaining(['body: date', 'body: action']));
    expect(
      (
        await stack.send(
          'POST',
          path,
          { date: '2026-07-30', action: 'fan_repaired', by: 'someone else' },
          'engineer',
        )
      ).status,
    ).toBe(400);
    const huge = await stack.send(
      'POST',
      path,
      { date: '2026-07-30', action: 'fan_repaired', note: 'x'.repeat(200_000) },
      'engineer',
    );
    expect(huge.status).toBe(413);
    const text = await fetch(`${stack.url}${path}`, {
      method: 'POST',
      headers: { authorization: `Bearer ${TOKENS.engineer}`, 'content-type': 'text/plain' },
      body: 'date=2026-07-30',
    });
    expect(text.status).toBe(415);
    expect((await stack.get(`/api/vehicles/${ID}/trips?limit=-1`)).status).toBe(400);
    expect((await stack.get(`/api/vehicles/${ID}/trips?sort=1`)).status).toBe(400);
    expect((await stack.get(`/api/vehicles/${ID}/trips?from=2026-02-30`)).status).toBe(400);
    expect((await stack.get(`/api/vehicles/${ID}/trips?limit=0x10`)).status).toBe(400); // decimal only
    // Nested brackets (100 000 gave a 500, a stack overflow): refused by depth before parsing.
    for (const [method, where] of [
      ['PUT', '/api/fleet'],
      ['POST', path],
    ] as const) {
      const deep = await stack.send(
        method,
        where,
        `{"vehicles":${'['.repeat(20_000)}${']'.repeat(20_000)}}`,
        'admin',
        true,
      );
      expect(deep.status, where).toBe(400);
      expect(((await deep.json()) as { error: { message: string } }).error.message).toBe(
        'body nests deeper than 32 levels',
      );
    }
    expect(await auditCount()).toBe(before);
  });

  it('injection-shaped ids are refused with 400 or 404, never reach a query, and change nothing', async () => {
    const before = await auditCount();
    for (const bad of ["x' OR '1'='1", '"; DROP TABLE trip_results; --', '../../etc/passwd', '..', 'a b']) {
      const e = encodeURIComponent(bad);
      for (const r of [
        await stack.get(`/api/vehicles/${e}`),
        await stack.get(`/api/vehicles/${e}/trips`),
        await stack.get(`/api/vehicles/${ID}/trips/${e}`),
        await stack.send(
          'POST',
          `/api/vehicles/${e}/maintenance`,
          { date: '2026-07-30', action: 'fan_repaired' },
          'engineer',
        ),
      ]) {
        expect([400, 404], bad).toContain(r.status);
        const body = (await r.json()) as { error: { code: string; message: string } };
        expect(body.error.message).not.toMatch(/at .*\.ts:\d+/); // no stack trace
      }
    }
    expect(await auditCount()).toBe(before);
    expect((await stack.get('/api/fleet')).status).toBe(200);
  });

  it('unknown routes are JSON 404s; security headers set; CORS closed by default', async () => {
    const r = await stack.get('/api/nothing-here');
    expect(r.status).toBe(404);
    expect(((await r.json()) as { error: { code: string } }).error.code).toBe('not_found');
    const h = await fetch(`${stack.url}/api/health`, { headers: { origin: 'http://elsewhere.example' } });
    expect(h.headers.get('access-control-allow-origin')).toBeNull();
    expect(h.headers.get('x-content-type-options')).toBe('nosniff');
    expect(h.headers.get('content-security-policy')).toMatch(/default-src 'self'/);
  });

  it('a fleet file that is not valid is refused with its field, and the old one stays', async () => {
    const broken = { vehicles: [{ ...scenario.fleet.vehicles[0]!, radiator_area_m2: -1 }] };
    const r = await stack.send('PUT', '/api/fleet', broken, 'admin');
    expect(r.status).toBe(400);
    const problems = ((await r.json()) as { error: { problems: { where: string }[] } }).error.problems;
    expect(problems[0]!.where).toMatch(/vehicles\[0\]\.radiator_area_m2/);
    expect((await stack.get(`/api/vehicles/${ID}`)).status).toBe(200);
  });

  it('a sample store that stops answering gives 503 naming the store, and status says it is down', async () => {
    const gone = createSqliteStore({ path: join(dir, 'gone.db') });
    const other = await startApiStack(
      tempDir('api-gone'),
      scenario.fleet,
      gone,
      () => scenario.history.to_ms,
    );
    try {
      await gone.close();
      for (const path of ['/api/rejected', '/api/rejected/messages', '/api/fleet']) {
        const r = await other.get(path);
        expect(r.status, path).toBe(503);
        const body = (await r.json()) as { error: { code: string; message: string } };
        expect(body.error.code, path).toBe('store_unavailable');
        expect(body.error.message, path).toMatch(/^sample store \(sqlite\): not answering \(/);
      }
      const status = (await (await other.get('/api/status')).json()) as {
        store: { up: boolean; error: string };
      };
      expect(status.store.up).toBe(false);
      expect(status.store.error).toMatch(/sqlite/);
    } finally {
      await other.close();
    }
  });

  it('wrong tokens: 5 free per address, then 429 before any token is read, the wait doubling, logged; a valid token clears it', async () => {
    const clock = { ms: scenario.history.to_ms };
    const logged: Record<string, unknown>[] = [];
    const other = await startApiStack(tempDir('api-backoff'), scenario.fleet, samples, () => clock.ms, {
      log: (event, detail) => logged.push({ event, ...detail }),
    });
    const ask = (token: string) =>
      fetch(`${other.url}/api/fleet`, { headers: { authorization: `Bearer ${token}` } });
    const wrong = () => ask('not-a-token-at-all').then((r) => r.status);
    try {
      const first = [];
      for (let i = 0; i < 9; i++) first.push(await wrong());
      expect(first).toEqual([401, 401, 401, 401, 401, 401, 429, 429, 429]);
      const waiting = await ask(TOKENS.viewer);
      expect(waiting.status).toBe(429); // the address waits, whatever its token
      expect(waiting.headers.get('retry-after')).toBe('1');
      clock.ms += 1000;
      expect([await wrong(), await wrong()]).toEqual([401, 429]);
      clock.ms += 2000;
      expect((await ask(TOKENS.viewer)).status).toBe(200);
      expect(await wrong()).toBe(401); // cleared by the valid token
      expect(logged.filter((l) => l.event === 'auth_backoff')).toEqual([
        { event: 'auth_backoff', address: '127.0.0.1', failures: 6, wait_s: 1 },
        { event: 'auth_backoff', address: '127.0.0.1', failures: 7, wait_s: 2 },
      ]);
    } finally {
      await other.close();
    }
  });

  it('revoking a token closes its open event stream at once', async () => {
    const made = await stack.send('POST', '/api/tokens', { name: 'watcher', role: 'viewer' }, 'admin');
    const { token } = (await made.json()) as { token: string };
    const auth = { authorization: `Bearer ${token}` };
    const res = await fetch(`${stack.url}/api/events`, { headers: auth });
    expect(res.status).toBe(200);
    const reader = res.body!.getReader();
    expect((await stack.send('DELETE', '/api/tokens/watcher', {}, 'admin')).status).toBe(200);
    let text = '';
    for (let r = await reader.read(); !r.done; r = await reader.read())
      text += new TextDecoder().decode(r.value);
    expect(text).toContain('event: revoked');
    expect((await fetch(`${stack.url}/api/events`, { headers: auth })).status).toBe(401);
  });
});
