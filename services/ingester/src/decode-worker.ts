import { parentPort, workerData } from 'node:worker_threads';
import type { DecodeJob, DecodeResult, DecodeWorkerData } from './decode-pool.ts';
import { safeDecode } from './decode.ts';
import { packSamples } from './sample-pack.ts';
import { vehicleReadings } from './vehicle-readings.ts';

/** A decode thread of `DecodePool`: payload bytes in, packed samples and dead letters out. */
const { known_vehicles, max_payload_bytes, vehicle_maps } = workerData as DecodeWorkerData;
const known = new Set(known_vehicles);
const readings = vehicleReadings(vehicle_maps);
const port = parentPort!;

port.on('message', (job: DecodeJob) => {
  const payload = Buffer.from(job.payload.buffer, job.payload.byteOffset, job.payload.byteLength);
  const d = safeDecode(
    job.topic,
    payload,
    { known_vehicles: known, now_ms: job.now_ms, max_payload_bytes, readings },
    job.parsed,
  );
  const samples = packSamples(d.samples);
  const result: DecodeResult = {
    id: job.id,
    samples,
    rejects: d.rejects,
    refused: d.refused,
    tallies: d.tallies,
  };
  port.postMessage(result, [samples.numbers.buffer]);
});
port.postMessage('ready');
