import { open, stat } from 'node:fs/promises';
import type { BrokerRefusal } from '@thermargin/shared';

/**
 * Mosquitto 2.0 says what it refused only in its log: a login as "Client <id> disconnected, not
 * authorised." (notice; `<unknown>` when the client gave no usable id, the line before then naming its
 * address in "Sending CONNACK to <address> (0, 5)"), a publish outside the client's ACL as "Denied
 * PUBLISH from <id> (d0, q1, r0, m1, '<topic>', ... (N bytes))" (debug). Each line starts with the
 * time in seconds since 1970 unless `log_timestamp` is off.
 */
const STAMPED = /^(\d+): (.*)$/;
const LOGIN = /^Client (\S+) disconnected, not authorised\.$/;
const CONNACK = /^Sending CONNACK to (\S+) \(\d+, \d+\)$/;
const DENIED = /^Denied PUBLISH from (\S+) \(d\d, q\d, r\d, m\d+, '(.*)', \.\.\. \(\d+ bytes\)\)$/;

/** The refusal one line of Mosquitto's log reports (the line before it names a refused login's address). */
export function mosquittoRefusal(line: string, before = '', now_ms = Date.now()): BrokerRefusal | undefined {
  const stamped = STAMPED.exec(line);
  const text = stamped ? stamped[2]! : line;
  const time_ms = stamped ? Number(stamped[1]) * 1000 : now_ms;
  const login = LOGIN.exec(text);
  if (login) {
    const id = login[1] === '<unknown>' ? '' : login[1]!;
    const from = id ? undefined : CONNACK.exec(STAMPED.exec(before)?.[2] ?? before)?.[1];
    const detail = `wrong user name or password${from ? ` (from ${from})` : ''}`;
    return { time_ms, client_id: id, username: '', reason: 'broker_login', topic: '', detail };
  }
  const denied = DENIED.exec(text);
  if (denied)
    // On the vehicles' listener the client id is the user name (use_username_as_clientid).
    return {
      time_ms,
      client_id: denied[1]!,
      username: denied[1]!,
      reason: 'broker_denied',
      topic: denied[2]!,
      detail: 'publish outside its topics',
    };
  return undefined;
}

const POLL_MS = 500;
/** bytes read per poll at most: a burst of log is caught up over a few polls, memory stays bounded. */
const CHUNK_BYTES = 4 * 1024 * 1024;

/**
 * Follows Mosquitto's log file from its current end (what was logged before is not counted again after
 * a restart) and tells `onRefused` of each refusal. A file truncated or replaced (log rotation) is read
 * again from its start; a file not there yet is waited for.
 */
export function followMosquittoLog(path: string, onRefused: (r: BrokerRefusal) => void) {
  let offset: number | undefined;
  let inode: number | undefined;
  let partial = '';
  let previous = '';
  let polling: Promise<void> = Promise.resolve();

  async function readNew(): Promise<void> {
    const s = await stat(path).catch(() => undefined);
    if (!s) {
      offset ??= 0; // created later: all of it is new
      return;
    }
    if (offset === undefined || s.ino !== inode || s.size < offset) {
      const first = offset === undefined;
      offset = first ? s.size : 0;
      inode = s.ino;
      partial = '';
      if (first) return;
    }
    if (s.size === offset) return;
    const length = Math.min(s.size - offset, CHUNK_BYTES);
    const file = await open(path, 'r');
    try {
      const { bytesRead, buffer } = await file.read(Buffer.alloc(length), 0, length, offset);
      offset += bytesRead;
      const lines = (partial + buffer.toString('utf8', 0, bytesRead)).split('\n');
      partial = lines.pop()!;
      for (const line of lines) {
        const r = mosquittoRefusal(line, previous);
        if (r) onRefused(r);
        previous = line;
      }
    } finally {
      await file.close();
    }
  }
  const poll = () => {
    polling = polling.then(readNew).catch(() => {});
    return polling;
  };
  void poll();
  const timer = setInterval(() => void poll(), POLL_MS);
  timer.unref();
  return {
    /** Reads what is there now (tests; the last lines before a stop). */
    poll,
    async close(): Promise<void> {
      clearInterval(timer);
      await poll();
    },
  };
}
