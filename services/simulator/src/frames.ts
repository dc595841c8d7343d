import {
  CAN_EXTENDED,
  type CanFrame,
  type DataMap,
  type FleetInput,
  type Sample,
  type VehicleConfigInput,
} from '@thermargin/shared';
import { j1939Id } from '@thermargin/logger-data/j1939/identifier';

/**
 * The demo's loggers as SAE J1939 frames: each sample becomes the messages that carry it, the way a
 * telematics logger that keeps the latest frame of each PGN once a second sends them. Standard messages
 * for what J1939-71 defines (ET1 and ET3 coolant, AMB ambient, CCVS1 speed, FD1 fan, EEC1 engine speed
 * and torque for the combustion trucks, with EC1's reference torque as a BAM every half minute), and one
 * proprietary message of the demo's own for what it does not: radiator outlet temperature, coolant flow,
 * the derate flag and, on electric drivetrains, traction power. `DEMO_FRAME_MAPS` describe it.
 */

/** Source addresses (invented for the demo): the engine or drive controller, and the cooling controller. */
const ENGINE_SA = 0x00;
const COOLING_SA = 0x27;
/** The demo's proprietary PGN (J1939-21 proprietary B range, 65280–65535). */
const DEMO_PGN = 65312;
/** N·m: the demo trucks' engine reference torque (a round figure for a 13 L engine, common practice). */
export const DEMO_REFERENCE_TORQUE_NM = 2600;

const proprietary = (signal: 'coolant_out_c' | 'coolant_flow_lpm' | 'derate' | 'power_kw') =>
  ({
    coolant_out_c: { start_bit: 0, length: 16, scale: 0.03125, offset: -273, unit: '°C' },
    coolant_flow_lpm: { start_bit: 16, length: 16, scale: 0.1, offset: 0, unit: 'L/min' },
    derate: { start_bit: 32, length: 2, scale: 1, offset: 0, unit: '0/1' },
    power_kw: { start_bit: 40, length: 16, scale: 0.1, offset: -3000, unit: 'kW' },
  })[signal];

const signal = (name: 'coolant_out_c' | 'coolant_flow_lpm' | 'derate' | 'power_kw') => ({
  signal: name,
  pgn: DEMO_PGN,
  source_address: COOLING_SA,
  ...proprietary(name),
});

/** The mappings the demo's vehicles come with: electric drivetrains send traction power themselves. */
export const DEMO_FRAME_MAPS: Record<'electric' | 'engine', DataMap> = {
  electric: {
    description:
      'demo logger, electric drivetrain: J1939-71 messages and the demo cooling controller’s PGN 65312',
    frames: { signals: (['coolant_out_c', 'coolant_flow_lpm', 'derate', 'power_kw'] as const).map(signal) },
  },
  engine: {
    description: 'demo logger, combustion engine: power from EEC1 and EC1, the rest as for electric',
    frames: { signals: (['coolant_out_c', 'coolant_flow_lpm', 'derate'] as const).map(signal) },
  },
};

const id = (pgn: number, source: number, priority = 6) =>
  (j1939Id(priority, pgn, source) | CAN_EXTENDED) >>> 0;
const ET1 = id(65262, ENGINE_SA);
const ET3 = id(65129, ENGINE_SA);
const AMB = id(65269, ENGINE_SA);
const CCVS1 = id(65265, ENGINE_SA);
const FD1 = id(65213, ENGINE_SA);
const EEC1 = id(61444, ENGINE_SA, 3);
const COOLING = id(DEMO_PGN, COOLING_SA);
const TP_CM = id(60416, ENGINE_SA, 7);
const TP_DT = id(60160, ENGINE_SA, 7);

/** A raw value, clamped into the J1939 valid range of its size (0…0xFA, 0…0xFAFF). */
const raw = (value: number, scale: number, offset: number, max: number) =>
  Math.min(max, Math.max(0, Math.round((value - offset) / scale)));
const u16 = (d: Uint8Array, at: number, v: number) => {
  d[at] = v & 0xff;
  d[at + 1] = v >> 8;
};
const blank = () => new Uint8Array(8).fill(0xff);

/** rpm: the demo trucks' engine speed, from road speed (a gear-like rise), high enough to give the power. */
function engineRpm(speed_kmh: number, power_kw: number): number {
  const byRoad = Math.min(1800, 650 + 13 * speed_kmh);
  const forPower = (Math.max(0, power_kw) * 1000) / (DEMO_REFERENCE_TORQUE_NM * 0.95 * (Math.PI / 30));
  return Math.min(2400, Math.max(byRoad, forPower));
}

/** µs before the sample's own time at which each message goes out: all within the second before it. */
const SLOT_US = 5000;

/** The frames that carry one sample: all in (t − 1 s, t], so a sample rebuilt at t sees exactly them. */
export function sampleFrames(s: Sample, engine: boolean): CanFrame[] {
  const t = s.time_ms * 1000;
  const out: CanFrame[] = [];
  const put = (frameId: number, data: Uint8Array) =>
    out.push({ time_us: t - (7 - out.length) * SLOT_US, id: frameId, data });
  let d = blank();
  if (engine) {
    const rpm = engineRpm(s.speed_kmh, s.power_kw);
    const pct = ((s.power_kw * 1000) / (DEMO_REFERENCE_TORQUE_NM * rpm * (Math.PI / 30))) * 100;
    d[2] = raw(pct, 1, -125, 0xfa);
    u16(d, 3, raw(rpm, 0.125, 0, 0xfaff));
    put(EEC1, d);
  }
  d = blank();
  u16(d, 1, raw(s.speed_kmh, 1 / 256, 0, 0xfaff));
  put(CCVS1, d);
  d = blank();
  d[0] = raw(s.coolant_in_c, 1, -40, 0xfa);
  put(ET1, d);
  d = blank();
  u16(d, 2, raw(s.coolant_in_c, 0.03125, -273, 0xfaff));
  put(ET3, d);
  d = blank();
  u16(d, 3, raw(s.ambient_c, 0.03125, -273, 0xfaff));
  put(AMB, d);
  d = blank();
  d[0] = raw(s.fan_pct, 0.4, 0, 0xfa);
  put(FD1, d);
  d = blank();
  if (s.coolant_out_c !== undefined) u16(d, 0, raw(s.coolant_out_c, 0.03125, -273, 0xfaff));
  if (s.coolant_flow_lpm !== undefined) u16(d, 2, raw(s.coolant_flow_lpm, 0.1, 0, 0xfaff));
  d[4] = 0xfc | (s.derate === undefined ? 3 : s.derate);
  if (!engine) u16(d, 5, raw(s.power_kw, 0.1, -3000, 0xfaff));
  put(COOLING, d);
  return out;
}

/** The BAM of EC1 (39 bytes, reference torque in bytes 20–21), its packets 50 ms apart from `t_us`. */
export function referenceTorqueBam(t_us: number): CanFrame[] {
  const ec1 = new Uint8Array(42).fill(0xff);
  u16(ec1, 19, DEMO_REFERENCE_TORQUE_NM);
  // TP.CM: control 32 (BAM), size 39, 6 packets, reserved, PGN 65251.
  const announce = Uint8Array.from([32, 39, 0, 6, 0xff, 0xe3, 0xfe, 0x00]);
  const frames: CanFrame[] = [{ time_us: t_us, id: TP_CM, data: announce }];
  for (let k = 0; k < 6; k++)
    frames.push({
      time_us: t_us + 50_000 * (k + 1),
      id: TP_DT,
      data: Uint8Array.from([k + 1, ...ec1.subarray(k * 7, k * 7 + 7)]),
    });
  return frames;
}

/** One `candump -l` line for a frame (on interface can0). */
export function candumpLine(f: CanFrame): string {
  const sec = Math.floor(f.time_us / 1e6);
  const us = String(f.time_us - sec * 1e6).padStart(6, '0');
  const ext = (f.id & CAN_EXTENDED) !== 0;
  const ident = (f.id & 0x1fff_ffff)
    .toString(16)
    .toUpperCase()
    .padStart(ext ? 8 : 3, '0');
  return `(${sec}.${us}) can0 ${ident}#${Buffer.from(f.data).toString('hex').toUpperCase()}`;
}

/** ms: how often the trucks' engines repeat EC1 (a BAM) on the bus. */
const BAM_EVERY_MS = 30_000;

/** A vehicle's frames in time order, from its samples in time order (EC1 from combustion engines too). */
export function* vehicleFrames(samples: Iterable<Sample>, engine: boolean): Generator<CanFrame> {
  let nextBam = Number.NEGATIVE_INFINITY;
  for (const s of samples) {
    if (engine && s.time_ms >= nextBam) {
      yield* referenceTorqueBam(s.time_ms * 1000 - 900_000);
      nextBam = s.time_ms + BAM_EVERY_MS;
    }
    yield* sampleFrames(s, engine);
  }
}

/** Whether the vehicle's frames carry engine messages (EEC1, EC1) rather than the traction power PGN. */
export const sendsEngineFrames = (v: Pick<VehicleConfigInput, 'powertrain'>) => v.powertrain === 'ice';

/**
 * The fleet file for frames: each vehicle (or those in `only`) with its logger's mapping, the trucks with
 * their reference torque.
 */
export function framesFleet(fleet: FleetInput, only?: ReadonlySet<string>): FleetInput {
  return {
    ...fleet,
    vehicles: fleet.vehicles.map((v) =>
      only && !only.has(v.id)
        ? v
        : sendsEngineFrames(v)
          ? { ...v, data_map: DEMO_FRAME_MAPS.engine, engine_reference_torque_nm: DEMO_REFERENCE_TORQUE_NM }
          : { ...v, data_map: DEMO_FRAME_MAPS.electric },
    ),
  };
}
