import { READ_DEFAULTS } from '@thermargin/usecases/options';

/** The analyzer's settings: how often it polls, and how it reads (READ_DEFAULTS, shared with sizing). */
export const ANALYZER_DEFAULTS = {
  /** ms, 10 000: how often the store is polled for new samples (`poke()` runs sooner). */
  poll_ms: 10_000,
  ...READ_DEFAULTS,
};

export type AnalyzerOptions = typeof ANALYZER_DEFAULTS;
