import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Sample } from '@thermargin/shared';
import type { Scenario } from '@thermargin/simulator';
import { createSqliteStore, type SampleStore } from '@thermargin/store';

/** Writes `samples` to `store` in calls of `batch` (a scenario's history is too large for one). */
export async function writeInBatches(
  store: SampleStore,
  samples: Iterable<Sample>,
  batch = 20_000,
): Promise<void> {
  let list: Sample[] = [];
  for (const s of samples) {
    list.push(s);
    if (list.length === batch) {
      await store.writeSamples(list);
      list = [];
    }
  }
  if (list.length) await store.writeSamples(list);
}

/** A scenario's whole history in a SQLite sample store and its fleet file, both in `dir`. */
export async function writeScenarioFiles(
  dir: string,
  scenario: Scenario,
): Promise<{ samples_path: string; fleet_file: string }> {
  const samples_path = join(dir, 'samples.db');
  const store = createSqliteStore({ path: samples_path, synchronous: 'normal' });
  for (const v of scenario.fleet.vehicles) await writeInBatches(store, scenario.vehicleSamples(v.id));
  await store.close();
  const fleet_file = join(dir, 'fleet.json');
  writeFileSync(fleet_file, JSON.stringify(scenario.fleet));
  return { samples_path, fleet_file };
}
