import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { API_ROLES, type ApiRole, isValidId } from '@thermargin/shared';
import type { Actor, WorkflowStore } from '@thermargin/store/workflow';

export interface TokenEntry {
  name: string;
  role: ApiRole;
  /** Hex SHA-256 of the secret: the secret itself is never kept. */
  sha256: string;
  source: 'env' | 'file' | 'api';
}

export const sha256Hex = (s: string) => createHash('sha256').update(s, 'utf8').digest('hex');

const isRole = (r: string): r is ApiRole => (API_ROLES as readonly string[]).includes(r);

/**
 * `name:role:secret` or `name:role:sha256:<64 hex>` entries, comma-separated (API_TOKENS). A secret is
 * hashed at once. Throws naming the entry (never its secret) when one is malformed.
 */
export function parseTokenList(text: string, source: 'env' | 'file'): TokenEntry[] {
  return text
    .split(/[,\n]/)
    .map((s) => s.trim())
    .filter(Boolean)
    .map((entry, i) => {
      const [name = '', role = '', ...rest] = entry.split(':');
      const secret = rest.join(':');
      const hashed = /^sha256:([0-9a-f]{64})$/.exec(secret);
      if (!isValidId(name) || !isRole(role) || (!hashed && secret.length < 16))
        throw new Error(
          `tokens (${source}) entry ${i + 1}: want name:role:secret (role one of ${API_ROLES.join(', ')}, secret ≥ 16 characters) or name:role:sha256:<hex>`,
        );
      return { name, role, sha256: hashed ? hashed[1]! : sha256Hex(secret), source };
    });
}

/** A token file: JSON `{ "tokens": [{ "name", "role", "sha256" }] }`, or lines in the API_TOKENS form. */
export function readTokenFile(path: string): TokenEntry[] {
  const text = readFileSync(path, 'utf8');
  if (!text.trimStart().startsWith('{')) return parseTokenList(text, 'file');
  const data = JSON.parse(text) as { tokens?: { name: string; role: string; sha256: string }[] };
  return parseTokenList(
    (data.tokens ?? []).map((t) => `${t.name}:${t.role}:sha256:${t.sha256}`).join(','),
    'file',
  );
}

/** The tokens the API accepts: configured ones plus those added through the API (kept hashed). */
export class TokenRegistry {
  /** Token name → what to do when it is revoked (close its event streams). */
  private readonly onRevoke = new Map<string, Set<() => void>>();

  constructor(
    private readonly configured: readonly TokenEntry[],
    private readonly workflow: WorkflowStore,
  ) {}

  async list(): Promise<TokenEntry[]> {
    const added = (await this.workflow.tokens()).map((t) => ({
      name: t.name,
      role: t.role,
      sha256: t.sha256,
      source: 'api' as const,
    }));
    return [...this.configured, ...added];
  }

  /** The entry whose hash matches; every entry is compared in constant time (no early exit). */
  async verify(secret: string): Promise<TokenEntry | undefined> {
    const digest = createHash('sha256').update(secret, 'utf8').digest();
    let found: TokenEntry | undefined;
    for (const t of await this.list()) {
      const h = Buffer.from(t.sha256, 'hex');
      if (h.length === digest.length && timingSafeEqual(h, digest) && !found) found = t;
    }
    return found;
  }

  /** A new random secret for `name` (shown once). */
  async add(name: string, role: ApiRole, actor: Actor, now_ms: number): Promise<string> {
    const secret = `tm_${randomBytes(24).toString('base64url')}`;
    await this.workflow.addToken({ name, role, sha256: sha256Hex(secret), created_ms: now_ms }, actor);
    return secret;
  }

  /** Removes an API-added token and tells everyone holding it; false when there is none of that name. */
  async revoke(name: string, actor: Actor, now_ms: number): Promise<boolean> {
    if (!(await this.workflow.removeToken(name, actor, now_ms))) return false;
    for (const f of this.onRevoke.get(name) ?? []) f();
    this.onRevoke.delete(name);
    return true;
  }

  /** Calls `f` when the token `name` is revoked in this process; returns the unsubscribe. */
  whenRevoked(name: string, f: () => void): () => void {
    let set = this.onRevoke.get(name);
    if (!set) this.onRevoke.set(name, (set = new Set()));
    set.add(f);
    return () => set.delete(f);
  }

  /** Whether the token with this hash is still listed (a revocation by another API process). */
  async isListed(sha256: string): Promise<boolean> {
    return (await this.list()).some((t) => t.sha256 === sha256);
  }

  isConfigured(name: string): boolean {
    return this.configured.some((t) => t.name === name);
  }
}
