import { readFileSync } from 'node:fs';
import { join } from 'node:path';

export const ROOT = join(import.meta.dirname, '../..');

export interface ComposeService {
  image?: string;
  build?: string;
  command?: string[];
  environment?: Record<string, string>;
  volumes?: string[];
  ports?: string[];
  depends_on?: Record<string, { condition: string }>;
  healthcheck?: { test: string[] };
  restart?: string;
}

export interface ComposeFile {
  services: Record<string, ComposeService>;
  volumes: Record<string, unknown>;
}

/**
 * docker-compose.yml, written in YAML's JSON-like flow style: its comment lines and the trailing commas
 * the formatter may add (valid YAML) are the only things removed before JSON.parse.
 */
export function readCompose(): ComposeFile {
  const text = readFileSync(join(ROOT, 'docker-compose.yml'), 'utf8')
    .replace(/^\s*#.*$/gm, '')
    .replace(/,(\s*[}\]])/g, '$1');
  return JSON.parse(text) as ComposeFile;
}

/** The variables of an env file (KEY=value lines). */
export function readEnvFile(path: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const line of readFileSync(path, 'utf8').split('\n')) {
    const m = /^([A-Z0-9_]+)=(.*)$/.exec(line.trim());
    if (m) out[m[1]!] = m[2]!;
  }
  return out;
}

/** `${NAME}`, `${NAME:?message}`, `${NAME:-default}` replaced from `env`, as compose interpolates. */
export function interpolate(value: string, env: Record<string, string>): string {
  return value.replace(/\$\{([A-Z0-9_]+)(?::[?-][^}]*)?\}/g, (_, name: string) => env[name] ?? '');
}

/** Every `${NAME…}` a value refers to. */
export function referencedVariables(value: string): string[] {
  return [...value.matchAll(/\$\{([A-Z0-9_]+)/g)].map((m) => m[1]!);
}
