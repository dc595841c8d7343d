import { renameSync, writeFileSync } from 'node:fs';
import { fleetFromText, type LoadedFleet, loadFleetFile } from '@thermargin/usecases/fleet-file';
import type { FleetSource } from './deps.ts';

/** The fleet file at `path`: loaded now, reloaded or replaced (written atomically) on request. */
export function fileFleetSource(path: string): FleetSource {
  let current: LoadedFleet = loadFleetFile(path);
  return {
    current: () => current,
    reload: () => (current = loadFleetFile(path)),
    replace(text) {
      const next = fleetFromText(text, 'body');
      const tmp = `${path}.tmp-${process.pid}`;
      writeFileSync(tmp, text);
      renameSync(tmp, path);
      return (current = next);
    },
  };
}
