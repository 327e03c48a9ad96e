/**
 * The client's initial JavaScript (what index.html loads before any route's own chunk), gzipped:
 * target under 300 kB, with routes split into lazy chunks.
 */
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import { execFileSync } from 'node:child_process';
import type { Bench } from './harness.js';

export default async function bundleBench(b: Bench): Promise<void> {
  execFileSync(process.execPath, ['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'], { stdio: 'inherit' });
  const html = fs.readFileSync('dist/index.html', 'utf8');
  const initial = [...html.matchAll(/(?:src|href)="(\/assets\/[^"]+\.js)"/g)].map((m) => m[1]);
  const gz = (f: string) => zlib.gzipSync(fs.readFileSync(path.join('dist', f))).length / 1024;
  const initialKb = initial.reduce((s, f) => s + gz(f), 0);
  const all = fs.readdirSync('dist/assets').filter((f) => f.endsWith('.js'));
  const allKb = all.reduce((s, f) => s + gz(`/assets/${f}`), 0);
  b.log(`initial JS: ${initial.length} file(s), ${initialKb.toFixed(1)} kB gzip; all ${all.length} chunks ${allKb.toFixed(1)} kB gzip`);
  b.record({ name: 'client bundle: initial JavaScript (kB gzip)', cohort: '-', medianMs: 0, p95Ms: 0, bareSqlMs: null, ratio: null, peakRssMb: 0, explain: null,
    target: '< 300 kB gzip', initialKbGzip: Number(initialKb.toFixed(1)), chunks: all.length, allKbGzip: Number(allKb.toFixed(1)) });
}
