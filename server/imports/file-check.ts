/**
 * What an uploaded file really is, from its first bytes (magic numbers) rather than its name,
 * and its SHA-256 (to recognise a file imported before). A CSV must be UTF-8 text.
 */
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { AppError } from '../http/errors.js';

export type UploadType = 'csv' | 'xlsx';

const MAGIC: { bytes: number[]; what: string }[] = [
  { bytes: [0x25, 0x50, 0x44, 0x46], what: 'a PDF document' },
  { bytes: [0x89, 0x50, 0x4e, 0x47], what: 'a PNG image' },
  { bytes: [0xff, 0xd8, 0xff], what: 'a JPEG image' },
  { bytes: [0x47, 0x49, 0x46, 0x38], what: 'a GIF image' },
  { bytes: [0x1f, 0x8b], what: 'a gzip archive' },
  { bytes: [0x4d, 0x5a], what: 'a Windows program' },
  { bytes: [0x7f, 0x45, 0x4c, 0x46], what: 'a program (ELF)' },
  { bytes: [0x52, 0x61, 0x72, 0x21], what: 'a RAR archive' },
  { bytes: [0x37, 0x7a, 0xbc, 0xaf], what: 'a 7-Zip archive' },
];
const ZIP = [0x50, 0x4b, 0x03, 0x04];
/** OLE2 compound file: an encrypted (password-protected) xlsx, or an old .xls workbook. */
const CFB = [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1];

const starts = (b: Buffer, sig: number[]) => b.length >= sig.length && sig.every((x, i) => b[i] === x);

export interface FileFacts { type: UploadType; sha256: string; size: number }

const wrongType = (name: string, what: string, hint: string) =>
  new AppError(400, 'wrong_file_type', `"${name}" is ${what}, not a CSV or XLSX spreadsheet`, { hint });

/** Declared type from the file name; .xls, .ods, .numbers and others are refused with a way out. */
export function typeFromName(name: string): UploadType {
  const ext = name.toLowerCase().split('.').pop() ?? '';
  if (ext === 'csv' || ext === 'txt') return 'csv';
  if (ext === 'xlsx') return 'xlsx';
  throw new AppError(400, 'unsupported_file_type', `"${name}" is not a .csv or .xlsx file`, {
    hint: ext === 'xls' || ext === 'ods' ? 'save it as "Excel Workbook (.xlsx)" or as "CSV UTF-8" and upload that' : 'upload the import template filled in (.xlsx) or a CSV file saved as UTF-8',
  });
}

/**
 * Checks the file's content against its extension, hashes it and (for CSV) validates UTF-8 and
 * the absence of NUL bytes in one pass.
 */
export async function checkUpload(filePath: string, originalName: string): Promise<FileFacts> {
  const declared = typeFromName(originalName);
  const size = (await fs.promises.stat(filePath)).size;
  if (size === 0) throw new AppError(400, 'empty_file', `"${originalName}" is empty (0 bytes)`, { hint: 'check that you chose the right file and that it was saved before uploading' });
  const fd = await fs.promises.open(filePath, 'r');
  const head = Buffer.alloc(Math.min(16, size));
  await fd.read(head, 0, head.length, 0);
  await fd.close();
  if (starts(head, CFB)) {
    throw new AppError(400, declared === 'xlsx' ? 'protected_workbook' : 'wrong_file_type',
      declared === 'xlsx' ? `"${originalName}" is password-protected (encrypted) or an old .xls workbook` : `"${originalName}" is an Excel workbook (.xls or encrypted), not CSV text`,
      { hint: 'remove the password (File > Info > Protect Workbook) and save it as "Excel Workbook (.xlsx)", then upload it again' });
  }
  const other = MAGIC.find((m) => starts(head, m.bytes));
  if (other) throw wrongType(originalName, other.what, 'upload the import template filled in (.xlsx) or a CSV file saved as UTF-8');
  const zip = starts(head, ZIP);
  if (declared === 'xlsx' && !zip) throw wrongType(originalName, 'not a real workbook (its content is not an .xlsx package)', 'open the file in your spreadsheet program and save it as "Excel Workbook (.xlsx)"');
  if (declared === 'csv' && zip) throw wrongType(originalName, 'a zip package (probably a workbook renamed to .csv)', 'upload it with its .xlsx name, or save it as "CSV UTF-8" first');

  const hash = createHash('sha256');
  const decoder = declared === 'csv' ? new TextDecoder('utf-8', { fatal: true }) : null;
  let offset = 0;
  for await (const chunk of fs.createReadStream(filePath) as AsyncIterable<Buffer>) {
    hash.update(chunk);
    if (decoder) {
      const nul = chunk.indexOf(0);
      if (nul >= 0) throw wrongType(originalName, 'a binary file (it contains NUL bytes)', 'save the spreadsheet as "CSV UTF-8 (comma delimited)" and upload that');
      try {
        decoder.decode(chunk, { stream: true });
      } catch {
        throw new AppError(400, 'not_utf8', `"${originalName}" is not UTF-8 text (an invalid byte near byte ${offset})`, {
          hint: 'save it as "CSV UTF-8 (comma delimited)" in your spreadsheet program (not plain "CSV", which may use another encoding)',
        });
      }
    }
    offset += chunk.length;
  }
  if (decoder) {
    try {
      decoder.decode();
    } catch {
      throw new AppError(400, 'not_utf8', `"${originalName}" is not UTF-8 text (it ends in the middle of a character)`, { hint: 'save it as "CSV UTF-8 (comma delimited)" and upload it again' });
    }
  }
  return { type: declared, sha256: hash.digest('hex'), size };
}
