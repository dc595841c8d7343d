import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createSqliteStore } from '@thermargin/store';
import { afterAll } from 'vitest';
import { storeContract } from './contract.ts';

const dir = mkdtempSync(join(tmpdir(), 'thermargin-sqlite-'));
let n = 0;
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// A real file (WAL needs one), fresh per test.
storeContract('sqlite', async () => createSqliteStore({ path: join(dir, `store-${n++}.db`) }));
