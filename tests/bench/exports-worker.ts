/**
 * One export in a process of its own (spawned by exports.bench.ts), so that its peak RSS is the
 * export's alone: the kernel's maxRSS of this process (getrusage), printed as JSON.
 * argv: DATABASE_URL-bearing env, then requestId.
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createDataSource } from '../../server/db/create-data-source.js';
import { loadConfig } from '../../server/config.js';
import { generateExport } from '../../server/exports/generate.js';

const requestId = process.argv[2];
const ds = await createDataSource(process.env.DATABASE_URL!, 4).initialize();
const config = loadConfig({ DATABASE_URL: 'postgres://unused', SESSION_SECRET: 's'.repeat(40), IDENTIFIER_HASH_SECRET: 'h'.repeat(40), DATA_DIR: process.env.EXPORT_BENCH_DIR ?? mkdtempSync(join(tmpdir(), 'alveolog-export-')) } as NodeJS.ProcessEnv);
const before = process.memoryUsage().rss;
const t0 = performance.now();
const result = await generateExport({ ds, readDs: ds, config, mailer: { send: async () => undefined, close: () => undefined } }, requestId, { progress: async () => undefined, isCancelled: async () => false });
const ms = performance.now() - t0;
process.stdout.write(`${JSON.stringify({ ms: Math.round(ms), rows: result.rows, bytes: result.bytes, rssBeforeMb: Math.round(before / 1048576), maxRssMb: Math.round(process.resourceUsage().maxRSS / 1024) })}\n`);
await ds.destroy();
