/**
 * CSV (RFC 4180, UTF-8 with a byte-order mark so spreadsheet programs read it as UTF-8) zipped
 * with its dictionary and README by archiver; rows stream into the zip with backpressure.
 */
import { createWriteStream } from 'node:fs';
import { PassThrough } from 'node:stream';
import archiver from 'archiver';
import { neutraliseFormula } from '../../../shared/exports/deid.js';
import type { Cell } from '../transform.js';
import type { FileParts, RowSink } from './types.js';

/** One CSV field: numbers and yes/no bare, text quoted when it holds a comma, quote or line break. */
export function csvField(v: Cell | undefined): string {
  if (v === null || v === undefined) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  if (typeof v === 'boolean') return v ? 'true' : 'false';
  const text = neutraliseFormula(v); // every text cell, README and dictionary included
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
export function csvLine(cells: readonly (Cell | undefined)[]): string {
  let line = cells.length ? csvField(cells[0]) : '';
  for (let i = 1; i < cells.length; i++) line += `,${csvField(cells[i])}`;
  return `${line}\r\n`;
}

export function openCsvZip(path: string, parts: FileParts, names: { data: string; dictionary: string; readme: string }): RowSink {
  const out = createWriteStream(path);
  // Level 1: CSV of coded values compresses well at once; level 6 cost seconds for a few percent.
  const zip = archiver('zip', { zlib: { level: 1 } });
  const done = new Promise<void>((resolve, reject) => {
    out.on('close', resolve);
    out.on('error', reject);
    zip.on('error', reject);
  });
  done.catch(() => undefined);
  zip.pipe(out);
  const data = new PassThrough({ highWaterMark: 64 * 1024 });
  zip.append(data, { name: names.data });
  data.write(`\uFEFF${csvLine(parts.header)}`);
  let buf = '';
  const flush = async () => {
    if (!buf) return;
    const ok = data.write(buf);
    buf = '';
    if (!ok) await new Promise<void>((r) => data.once('drain', () => r()));
  };
  return {
    async row(cells: Cell[]) {
      buf += csvLine(cells);
      if (buf.length > 16 * 1024) {
        await flush();
        // zlib's chunks complete only on a turn of the event loop: give it one.
        await new Promise((r) => setImmediate(r));
      }
    },
    async finish() {
      await flush();
      data.end();
      zip.append(`\uFEFF${[csvLine([...parts.dictionaryHeader]), ...parts.dictionary.map((r) => csvLine(r))].join('')}`, { name: names.dictionary });
      zip.append(`${parts.readme.map(([k, v]) => (k ? `${k}: ${v}` : `    ${v}`)).join('\n')}\n`, { name: names.readme });
      await zip.finalize();
      await done;
      return { sheets: 1 };
    },
    async abort() {
      data.destroy();
      zip.abort();
      out.destroy();
    },
  };
}
