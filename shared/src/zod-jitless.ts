import { z } from 'zod';

/**
 * For pages whose content security policy forbids eval (the dashboard's): zod compiles fast parsers with
 * `new Function` when it can, and its probe for that was a console error on every load. Import this
 * first, before any schema is built.
 */
z.config({ jitless: true });
