import { readdirSync, readFileSync, readlinkSync } from 'node:fs';

/**
 * Whether process `pid` holds the listening TCP socket on 127.0.0.1:`port` (Linux /proc).
 *
 * A port from `freePort` can be taken by another test file's server before ours binds it; the
 * loser exits, but its readiness probe still gets answers from the winner, and the two test files
 * then share one server. Checking the listener's owner makes such a start fail instead.
 */
export function listensOn(pid: number, port: number): boolean {
  const inode = listenerInode(port);
  if (inode === undefined) return false;
  const target = `socket:[${inode}]`;
  try {
    return readdirSync(`/proc/${pid}/fd`).some((fd) => {
      try {
        return readlinkSync(`/proc/${pid}/fd/${fd}`) === target;
      } catch {
        return false; // closed while we looked
      }
    });
  } catch {
    return false; // the process is gone
  }
}

const LISTEN = '0A';
const LOOPBACK_HEX = '0100007F';

/** The inode of the socket listening on 127.0.0.1:`port`, from /proc/net/tcp. */
function listenerInode(port: number): string | undefined {
  const local = `${LOOPBACK_HEX}:${port.toString(16).toUpperCase().padStart(4, '0')}`;
  for (const line of readFileSync('/proc/net/tcp', 'utf8').split('\n').slice(1)) {
    const f = line.trim().split(/\s+/);
    if (f[1] === local && f[3] === LISTEN) return f[9];
  }
  return undefined;
}
