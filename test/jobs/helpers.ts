/**
 * Shared helpers for the end-to-end job tests: a small RFC 4180 CSV reader
 * (the outputs are written by csv-stringify; reading them back with our own
 * parser keeps the check independent of the writer), temp folders, the e2e
 * scenarios, a one-day copy of the demo scenario, and a CLI runner.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parse, stringify } from 'yaml';

export const ROOT = process.cwd();
export const CLI = path.resolve(ROOT, 'dist/cli/main.js');
export const E2E_DIR = path.resolve(ROOT, 'fixtures/scenarios/e2e');
export const PAIR = path.join(E2E_DIR, 'pair.yaml');
export const DEMO = path.resolve(ROOT, 'fixtures/demo/scenario.yaml');

const made: string[] = [];

/** A fresh folder under the OS temp dir; removed by `removeTempDirs()` (call it in afterAll). */
export function tempDir(label: string): string {
  const d = mkdtempSync(path.join(tmpdir(), `passbudget-${label}-`));
  made.push(d);
  return d;
}

export function removeTempDirs(): void {
  for (const d of made.splice(0)) rmSync(d, { recursive: true, force: true });
}

export type CsvRecord = Record<string, string>;
export interface CsvTable { header: string[]; rows: CsvRecord[] }

/** Parse RFC 4180 text (quoted fields, doubled quotes, CRLF or LF). */
export function parseCsv(text: string): CsvTable {
  const records: string[][] = [];
  let field = '';
  let rec: string[] = [];
  let i = 0;
  let quoted = false;
  const n = text.length;
  while (i < n) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"') {
        if (text[i + 1] === '"') { field += '"'; i += 2; continue; }
        quoted = false; i++; continue;
      }
      field += ch; i++; continue;
    }
    if (ch === '"') { quoted = true; i++; continue; }
    if (ch === ',') { rec.push(field); field = ''; i++; continue; }
    if (ch === '\r' || ch === '\n') {
      rec.push(field); field = '';
      records.push(rec); rec = [];
      i += ch === '\r' && text[i + 1] === '\n' ? 2 : 1;
      continue;
    }
    field += ch; i++;
  }
  if (field !== '' || rec.length) { rec.push(field); records.push(rec); }
  const [header, ...body] = records;
  const rows = body.map((r, k) => {
    if (r.length !== header.length) throw new Error(`CSV row ${k + 2}: ${r.length} fields, header has ${header.length}`);
    const o: CsvRecord = {};
    header.forEach((h, j) => { o[h] = r[j]; });
    return o;
  });
  return { header, rows };
}

export function readCsv(file: string): CsvTable {
  return parseCsv(readFileSync(file, 'utf8'));
}

/** Every file in a folder (names sorted) with its bytes. */
export function folderBytes(dir: string): Map<string, Buffer> {
  const m = new Map<string, Buffer>();
  for (const f of readdirSync(dir).sort()) m.set(f, readFileSync(path.join(dir, f)));
  return m;
}

/**
 * The demo scenario cut to `duration` (default one day, from the demo's own
 * start unless `start` is given), written into `dir` with absolute element
 * paths and no output.dir, so it runs from anywhere.
 */
export function writeDemoCopy(dir: string, duration = '1d', start?: string): string {
  const doc = parse(readFileSync(DEMO, 'utf8')) as {
    window: { start: string; duration?: string; end?: string };
    satellites: { elements: string }[];
    output?: { dir?: string };
  };
  delete doc.window.end;
  doc.window.duration = duration;
  if (start) doc.window.start = start;
  for (const s of doc.satellites) s.elements = path.resolve(path.dirname(DEMO), s.elements);
  if (doc.output) delete doc.output.dir;
  const file = path.join(dir, 'demo-1d.yaml');
  writeFileSync(file, stringify(doc));
  return file;
}

export interface CliResult { code: number | null; stdout: string; stderr: string }

/** Run `node dist/cli/main.js ARGS` asynchronously (so several can overlap their start-up). */
export function runCli(args: string[], cwd = ROOT): Promise<CliResult> {
  return new Promise((done, fail) => {
    const child = spawn(process.execPath, [CLI, ...args], { cwd, stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, PASSBUDGET_DEBUG: '' } });
    let stdout = '';
    let stderr = '';
    child.stdout.setEncoding('utf8').on('data', (d) => { stdout += d; });
    child.stderr.setEncoding('utf8').on('data', (d) => { stderr += d; });
    child.on('error', fail);
    child.on('close', (code) => done({ code, stdout, stderr }));
  });
}

/** Map over items with at most `limit` promises in flight (2 cores: keep CLI spawns few at a time). */
export async function mapLimit<T, R>(items: readonly T[], limit: number, fn: (x: T, i: number) => Promise<R>): Promise<R[]> {
  const out: R[] = new Array(items.length);
  let next = 0;
  const worker = async () => {
    while (next < items.length) {
      const i = next++;
      out[i] = await fn(items[i], i);
    }
  };
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, worker));
  return out;
}

/** Number of a CSV cell; empty → NaN. */
export const num = (s: string | undefined): number => (s === undefined || s === '' ? NaN : Number(s));
