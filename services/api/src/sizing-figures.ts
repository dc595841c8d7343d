import {
  assembleSizingInput,
  sizingInputFromStore,
  type VehicleSizingInput,
  vehicleSizingInput,
} from '@thermargin/usecases/sizing-input';
import { type SizingResult, sizeFleet } from '@thermargin/core/sizing/fleet-sizing';
import { resolveSizingOptions, type WhatIfScenario } from '@thermargin/core/sizing/options';
import type { VehicleModel } from '@thermargin/core/vehicle/resolve';
import type { FleetInput } from '@thermargin/shared';
import type { ApiDeps } from './deps.ts';

export interface SizingFigures {
  computed_ms: number;
  trips_without_samples: number;
  sizing: SizingResult;
}

/** What-if replays kept per results state: each one reads every stored sample again. */
const WHAT_IF_KEPT = 8;

/**
 * The fleet's sizing figures from the stores (usecases/sizing-input.ts, as `thermargin sizing
 * --from-store`), computed on first use and kept until new trip results arrive or the fleet file
 * changes: the key is every vehicle's analysis version (bumped on each commit, by any process) and the
 * fleet file's generation. Each vehicle's sample evidence is kept by its own version and model, so a new
 * trip re-reads that vehicle's samples only (the fleet-wide aggregation is cheap). Concurrent requests
 * share one computation.
 */
export class SizingCache {
  private fleetAt: FleetInput | undefined;
  private fleetGen = 0;
  private figures: { key: string; value: Promise<SizingFigures> } | undefined;
  private whatIfs = new Map<string, Promise<SizingResult>>();
  private whatIfKey = '';
  private readonly parts = new Map<
    string,
    { version: number | undefined; model: VehicleModel; part: Promise<VehicleSizingInput> }
  >();
  private readonly options = resolveSizingOptions();

  constructor(
    private readonly deps: ApiDeps,
    private readonly clock: () => number,
  ) {}

  private async key(): Promise<string> {
    const input = this.deps.fleet.current().input;
    if (input !== this.fleetAt) {
      this.fleetAt = input;
      this.fleetGen++;
    }
    const versions = [...(await this.deps.results.versions())].sort(([a], [b]) => a.localeCompare(b));
    return `${this.fleetGen}|${versions.map(([v, n]) => `${v}:${n}`).join(',')}`;
  }

  /** A vehicle's part with the default options: kept while its version and model stay the same. */
  private part(v: VehicleModel, version: number | undefined): Promise<VehicleSizingInput> {
    const hit = this.parts.get(v.id);
    if (hit && hit.version === version && hit.model === v) return hit.part;
    const part = vehicleSizingInput(this.deps.samples, this.deps.results, v, this.options);
    const entry = { version, model: v, part };
    this.parts.set(v.id, entry);
    part.catch(() => {
      if (this.parts.get(v.id) === entry) this.parts.delete(v.id);
    });
    return part;
  }

  private async computeFigures(): Promise<SizingFigures> {
    const models = this.deps.fleet.current().models;
    const vehicles = [...models.values()];
    const versions = await this.deps.results.versions();
    for (const id of this.parts.keys()) if (!models.has(id)) this.parts.delete(id);
    const parts: VehicleSizingInput[] = [];
    for (const v of vehicles) parts.push(await this.part(v, versions.get(v.id)));
    const read = assembleSizingInput(vehicles, parts);
    return {
      computed_ms: this.clock(),
      trips_without_samples: read.trips_without_samples,
      sizing: sizeFleet(read.input, this.options),
    };
  }

  private async computeWhatIf(s: WhatIfScenario): Promise<SizingResult> {
    const o = resolveSizingOptions({ what_if: [s] });
    const vehicles = [...this.deps.fleet.current().models.values()];
    const read = await sizingInputFromStore(this.deps.samples, this.deps.results, vehicles, o);
    return sizeFleet(read.input, o);
  }

  /** The figures with the default options: those `thermargin sizing` writes without options. */
  async get(): Promise<SizingFigures> {
    const key = await this.key();
    if (this.figures?.key !== key) {
      const value = this.computeFigures();
      value.catch(() => {
        if (this.figures?.value === value) this.figures = undefined;
      });
      this.figures = { key, value };
    }
    return this.figures.value;
  }

  /**
   * A sizing result whose what-if list holds `s` (the recorded conditions first): the figures' own
   * when `s` is one of their scenarios, else one more replay, kept for the same results state.
   * Rejects with VehicleSamples' RangeError when the limit drop reaches a thermostat opening.
   */
  async whatIf(s: WhatIfScenario): Promise<SizingResult> {
    const figures = await this.get();
    const same = (x: WhatIfScenario) =>
      x.ambient_rise_k === s.ambient_rise_k && x.limit_drop_k === s.limit_drop_k;
    if (figures.sizing.options.what_if.some(same)) return figures.sizing;
    const key = await this.key();
    if (key !== this.whatIfKey) {
      this.whatIfKey = key;
      this.whatIfs.clear();
    }
    const id = `${s.ambient_rise_k},${s.limit_drop_k}`;
    let hit = this.whatIfs.get(id);
    if (hit) this.whatIfs.delete(id);
    else {
      const value = this.computeWhatIf(s);
      value.catch(() => {
        if (this.whatIfs.get(id) === value) this.whatIfs.delete(id);
      });
      hit = value;
    }
    this.whatIfs.set(id, hit); // newest last: the oldest is dropped first
    if (this.whatIfs.size > WHAT_IF_KEPT) this.whatIfs.delete(this.whatIfs.keys().next().value!);
    return hit;
  }
}
