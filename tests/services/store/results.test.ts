import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { isStorageError, storeEngine, storeFault } from '@thermargin/store';
import { MIGRATIONS, migrate } from '@thermargin/store/postgres-migrations';
import { openResults } from '@thermargin/store/results-backend';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type PostgresServer, startPostgres } from '../../support/servers/postgres.ts';
import { resultsContract } from './results-contract.ts';

resultsContract('sqlite (file, one connection per role)', async () => {
  const path = join(mkdtempSync(join(tmpdir(), 'thermargin-results-')), 'results.db');
  return { connect: () => openResults({ kind: 'sqlite', path }), concurrent: false };
});

let server: PostgresServer;
let n = 0;
beforeAll(async () => {
  server = await startPostgres();
});
afterAll(async () => {
  await server?.close();
});

// Debian's PostgreSQL 15; a fresh database per test, migrated by its first connection.
resultsContract('postgres (real PostgreSQL 15)', async () => {
  const url = await server.createDatabase(`results_${n++}`);
  return { connect: () => openResults({ kind: 'postgres', url }), concurrent: true };
});

describe('postgres faults', () => {
  it('a read-only database is said as such, naming PostgreSQL', async () => {
    const name = `faults_${n++}`;
    const url = await server.createDatabase(name);
    const admin = new pg.Client({ connectionString: url });
    await admin.connect();
    try {
      // What an operator's switch (or a hot standby) does to every new transaction.
      await admin.query(`ALTER DATABASE ${name} SET default_transaction_read_only = on`);
    } finally {
      await admin.end();
    }
    const e = await openResults({ kind: 'postgres', url }).then(
      (r) => r.close(),
      (x: unknown) => x,
    );
    expect(isStorageError(e)).toBe(true);
    expect(storeEngine(e)).toBe('postgres');
    expect(storeFault(e)).toEqual({
      kind: 'read_only',
      reason: 'read-only (SQLSTATE 25006: cannot execute CREATE TABLE in a read-only transaction)',
    });
  });
});

describe('postgres replicas that stall', () => {
  it("a transaction stalled past the lease time is ended by the server: its vehicle's lock is free again", async () => {
    const url = await server.createDatabase(`stall_${n++}`);
    const stalled = await openResults({ kind: 'postgres', url }, { lease_ttl_ms: 500 });
    const other = await openResults({ kind: 'postgres', url });
    try {
      let resume!: () => void;
      const paused = new Promise<void>((r) => {
        resume = r;
      });
      let holding!: () => void;
      const held = new Promise<void>((r) => {
        holding = r;
      });
      // A replica that takes the vehicle's lock, then stops answering (as a paused process does) until
      // the other replica has had its turn: without the server's timeout, neither would ever go on.
      const first = stalled.analysis.exclusive('bus-01', async () => {
        holding();
        await paused;
        await stalled.analysis.readAnalysis('bus-01');
      });
      first.catch(() => {});
      await held;
      await other.analysis.exclusive('bus-01', async () => {
        await other.analysis.readAnalysis('bus-01');
      });
      resume();
      const e = await first.then(
        () => undefined,
        (x: unknown) => x,
      );
      expect(isStorageError(e)).toBe(true);
      expect(storeFault(e).reason).toMatch(/idle-in-transaction timeout/);
      // The pool gave the dead connection up: the stalled replica's next call works.
      expect(await stalled.analysis.readAnalysis('bus-01')).toBeUndefined();
    } finally {
      await stalled.close();
      await other.close();
    }
  });
});

describe('postgres migrations', () => {
  it('apply each step once, also when replicas start together, and refuse a newer schema', async () => {
    const url = await server.createDatabase(`migrations_${n++}`);
    const pool = new pg.Pool({ connectionString: url });
    try {
      const runs = await Promise.all([migrate(pool), migrate(pool), migrate(pool)]);
      expect(runs.flat().sort()).toEqual(MIGRATIONS.map((m) => m.version));
      expect(await migrate(pool)).toEqual([]);
      const { rows } = await pool.query('SELECT version FROM schema_migrations ORDER BY version');
      expect(rows.map((r) => r.version)).toEqual(MIGRATIONS.map((m) => m.version));
      const next = MIGRATIONS.at(-1)!.version + 1;
      await pool.query("INSERT INTO schema_migrations (version, name) VALUES ($1, 'from the future')", [
        next,
      ]);
      await expect(openResults({ kind: 'postgres', url })).rejects.toThrow(
        `results database is at schema version ${next}, newer than this program's ${next - 1}`,
      );
    } finally {
      await pool.end();
    }
  });

  it('a failing step is rolled back whole and named', async () => {
    const url = await server.createDatabase(`migrations_${n++}`);
    const pool = new pg.Pool({ connectionString: url });
    try {
      const bad = [
        ...MIGRATIONS,
        { version: 999, name: 'broken', sql: 'CREATE TABLE x (a int); SELECT nope' },
      ];
      await expect(migrate(pool, bad)).rejects.toThrow(
        /migration 999 \(broken\) failed: column "nope" does not exist/,
      );
      const { rows } = await pool.query(
        "SELECT to_regclass('x') AS x, max(version) AS v FROM schema_migrations",
      );
      expect(rows[0]).toEqual({ x: null, v: MIGRATIONS.at(-1)!.version });
    } finally {
      await pool.end();
    }
  });
});
