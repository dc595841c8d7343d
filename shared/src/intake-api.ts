import { z } from 'zod';

const count = z.number().int();

// ---- GET /api/intake/frames (viewer): what the vehicles' CAN frames held, per vehicle
export const framesResponseSchema = z.object({
  /** Vehicles that sent frames, by id; counts over every frames message stored. */
  vehicles: z.array(
    z.object({
      vehicle: z.string(),
      /** Frames messages (batches) stored. */
      batches: count,
      frames: count,
      /** Frames of a PGN a parameter is read from. */
      decoded: count,
      /** Frames of PGNs nothing reads (counted, not refused). */
      unknown_pgn: count,
      /** Parameter values sent as "not available", and as "error" (SAE J1939-71): missing, not numbers. */
      not_available: count,
      error_values: count,
      /** Samples built, and those left out for a required signal missing. */
      samples: count,
      incomplete: count,
    }),
  ),
});
export type FramesResponse = z.infer<typeof framesResponseSchema>;
