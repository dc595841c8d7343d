/**
 * The parts of a 29-bit J1939 identifier (SAE J1939-21, "Data Link Layer", the PDU format): from the
 * most significant bit, priority (3 bits), extended data page (1), data page (1), PDU format PF (8), PDU
 * specific PS (8), source address (8).
 * - PDU1 (PF < 240): PS is the destination address and not part of the parameter group number, which
 *   then ends in 00 (a request to one device or to all, 255).
 * - PDU2 (PF ≥ 240): PS is the group extension, part of the PGN; the message is broadcast.
 * PGN = EDP·2¹⁷ + DP·2¹⁶ + PF·2⁸ + (PDU2 ? PS : 0).
 */
export interface J1939Id {
  priority: number;
  pgn: number;
  source: number;
  /** Destination address of a PDU1 message; 255 (global) for PDU2. */
  destination: number;
  pdu1: boolean;
}

/** Destination "global" (every device), J1939-21. */
export const GLOBAL_ADDRESS = 255;

/** The PGN of a 29-bit identifier (without any CAN flag bits). */
export function pgnOf(id29: number): number {
  const pf = (id29 >>> 16) & 0xff;
  const page = (id29 >>> 24) & 0x3; // EDP, DP
  return (page << 16) | (pf << 8) | (pf >= 240 ? (id29 >>> 8) & 0xff : 0);
}

export function parseJ1939Id(id29: number): J1939Id {
  const pf = (id29 >>> 16) & 0xff;
  const pdu1 = pf < 240;
  return {
    priority: (id29 >>> 26) & 0x7,
    pgn: pgnOf(id29),
    source: id29 & 0xff,
    destination: pdu1 ? (id29 >>> 8) & 0xff : GLOBAL_ADDRESS,
    pdu1,
  };
}

/** A 29-bit identifier from its parts (the destination counts only for a PDU1 PGN). */
export function j1939Id(priority: number, pgn: number, source: number, destination = GLOBAL_ADDRESS): number {
  const pf = (pgn >>> 8) & 0xff;
  const ps = pf < 240 ? destination & 0xff : pgn & 0xff;
  return (((priority & 7) << 26) | ((pgn >>> 16) << 24) | (pf << 16) | (ps << 8) | (source & 0xff)) >>> 0;
}
