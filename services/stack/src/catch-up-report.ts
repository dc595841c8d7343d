import { progressBar, roughDuration } from './progress-bar.ts';

/** What is read of the API's analyzer and results store (the parts of their interfaces used here). */
interface AnalyzerView {
  stats: { runs: number; running: boolean; backlog_vehicles: number; trips_analysed: number };
}
interface ResultsView {
  readAnalyses(): Promise<readonly { vehicle: string; analysed_to_ms: number }[]>;
  readTripResults(vehicle: string): Promise<readonly unknown[]>;
}

const POLL_MS = 1000;

/**
 * Waits until the analyzer has caught up with the back-filled history — a pass begun after `cut_ms`
 * left no vehicle behind — with a progress bar of the history analysed (watermarks between `from_ms`
 * and `cut_ms`), then says so with the totals. Returns early when `stop` aborts.
 */
export async function analysisCaughtUp(
  analyzer: AnalyzerView,
  results: ResultsView,
  from_ms: number,
  cut_ms: number,
  stop: AbortSignal,
): Promise<void> {
  const bar = progressBar('analysis');
  const t0 = Date.now();
  const runs0 = analyzer.stats.runs;
  const trips0 = analyzer.stats.trips_analysed;
  for (;;) {
    if (stop.aborted) return;
    const s = analyzer.stats;
    if (s.runs > runs0 + 1 && !s.running && s.backlog_vehicles === 0) break;
    const marks = await results.readAnalyses();
    const f = marks.length
      ? marks.reduce(
          (n, a) => n + Math.min(1, Math.max(0, (a.analysed_to_ms - from_ms) / (cut_ms - from_ms))),
          0,
        ) / marks.length
      : 0;
    bar.update(f, `${(s.trips_analysed - trips0).toLocaleString('en-US')} trips analysed`);
    await new Promise((r) => setTimeout(r, POLL_MS));
  }
  const marks = await results.readAnalyses();
  let trips = 0;
  for (const a of marks) trips += (await results.readTripResults(a.vehicle)).length;
  bar.done(`${trips.toLocaleString('en-US')} trips of ${marks.length} vehicles`);
  process.stderr.write(
    `analysis caught up in ${roughDuration(Date.now() - t0)}: every vehicle's status is on the dashboard; new trips are analysed as they end.\n`,
  );
}
