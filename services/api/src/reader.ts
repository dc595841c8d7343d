import { type Sample, withoutWindows } from '@thermargin/shared';
import type { SampleStore, VehicleSpan } from '@thermargin/store';
import type { AnalysisStore } from '@thermargin/store/analysis';
import type { StoredAssessment, VehicleData } from './views.ts';

/** A value recomputed at most every `ttl_ms`, one computation at a time. */
function cached<T>(ttl_ms: number, clock: () => number, load: () => Promise<T>): () => Promise<T> {
  let at = Number.NEGATIVE_INFINITY;
  let value: Promise<T> | undefined;
  return () => {
    const now = clock();
    // A clock stepped back (NTP) expires the value too, or it would be kept until the clock caught up.
    if (!value || now - at >= ttl_ms || now < at) {
      at = now;
      value = load();
      value.catch(() => {
        value = undefined;
      });
    }
    return value;
  };
}

/**
 * Reads results through a per-vehicle cache keyed by the analysis version (bumped on every commit,
 * by any process), so a page view parses a vehicle's trips once per change, not once per request.
 */
export class ResultReader {
  private readonly cache = new Map<string, VehicleData>();
  readonly latest: () => Promise<Map<string, Sample>>;
  readonly spans: () => Promise<VehicleSpan[]>;

  constructor(
    private readonly results: AnalysisStore,
    samples: SampleStore,
    clock: () => number,
    sample_cache_ms: number,
  ) {
    this.latest = cached(
      sample_cache_ms,
      clock,
      async () => new Map((await samples.latestSamples()).map((s) => [s.vehicle, s])),
    );
    this.spans = cached(sample_cache_ms, clock, () => samples.listVehicles());
  }

  private async load(vehicle: string, version: number): Promise<VehicleData | undefined> {
    const hit = this.cache.get(vehicle);
    if (hit && hit.version === version) return hit;
    const [result, analysis] = [
      await this.results.readVehicleResult(vehicle),
      await this.results.readAnalysis(vehicle),
    ];
    if (!result || !analysis) return undefined;
    const data: VehicleData = {
      version: analysis.version,
      result,
      analysis,
      assessment: analysis.assessment as StoredAssessment,
      // Screens read the figures; the window evidence stays in the store for the vehicle stage.
      newest_first: result.trips.map(withoutWindows).reverse(),
    };
    this.cache.set(vehicle, data);
    return data;
  }

  async vehicle(id: string): Promise<VehicleData | undefined> {
    const v = await this.results.version(id);
    return v === undefined ? undefined : this.load(id, v);
  }

  async all(): Promise<Map<string, VehicleData>> {
    const out = new Map<string, VehicleData>();
    for (const [id, v] of await this.results.versions()) {
      const d = await this.load(id, v);
      if (d) out.set(id, d);
    }
    return out;
  }
}
