/**
 * Atomic output: every file of a run is written under a temporary name in a
 * staging folder beside the target, and only renamed into the target folder
 * once the whole run has succeeded. A failed run leaves the target folder as
 * it was and removes its staging folder. A run killed outright (SIGKILL, power
 * loss) cannot clean up: its staging folder carries a marker file, and the
 * next run into the same place removes such folders whose run is gone.
 *
 * A write that fails for a reason outside the program (full disk, read-only
 * or unwritable folder) becomes one `OutputError` line naming the folder, the
 * file, what failed and, where known, the space the run needed.
 */
import {
  createWriteStream, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, renameSync, rmSync, statfsSync, writeFileSync,
  type WriteStream,
} from 'node:fs';
import { hostname } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { OutputError } from '../errors.js';

/** Name of the marker file inside every staging folder; only passbudget writes it. */
export const STAGING_MARKER = '.passbudget-staging';

interface StagingMarker { tool: 'passbudget'; pid: number; host: string; startedUtc: string }

/** What a failed write's errno code means, for a person. */
const WRITE_FAILURES: Record<string, string> = {
  ENOSPC: 'no space left on the device',
  EDQUOT: 'disk quota exceeded',
  EFBIG: 'file too large for the file system',
  EROFS: 'the file system is read-only',
  EACCES: 'permission denied',
  EPERM: 'operation not permitted',
  ENOTDIR: 'a part of the path is a file, not a folder',
  EISDIR: 'a folder stands where a file should go',
  EEXIST: 'a file stands where a folder should go',
  ENOTEMPTY: 'the target is a non-empty folder',
  EIO: 'input/output error on the device',
  EMFILE: 'too many open files',
  ENAMETOOLONG: 'the path is too long',
};

/** The errno code when `err` is a file-system failure the user can act on, else null. */
export function writeFailureCode(err: unknown): string | null {
  const code = (err as NodeJS.ErrnoException | null)?.code;
  return typeof code === 'string' && code in WRITE_FAILURES ? code : null;
}

/** "12.3 MB" (10^6 bytes), "512 kB", "800 B". */
export function formatBytes(n: number): string {
  if (!Number.isFinite(n)) return `${n} B`;
  if (n >= 1e9) return `${(n / 1e9).toFixed(2)} GB`;
  if (n >= 1e6) return `${(n / 1e6).toFixed(1)} MB`;
  if (n >= 1e3) return `${(n / 1e3).toFixed(0)} kB`;
  return `${Math.round(n)} B`;
}

/** Free bytes for an unprivileged writer on the file system holding `dir` (null when unknown). */
export function freeBytes(dir: string): number | null {
  try {
    const s = statfsSync(dir);
    return s.bavail * s.bsize;
  } catch {
    return null;
  }
}

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    // EPERM: it exists but belongs to someone else.
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Remove staging folders `.<name>.partial-*` beside `target` left by earlier
 * runs that were killed: only folders holding passbudget's marker, and only
 * when the run that wrote it is no longer alive on this host. Returns the
 * folders removed.
 */
export function removeStaleStaging(target: string): string[] {
  const parent = dirname(target);
  const prefix = `.${basename(target)}.partial-`;
  const removed: string[] = [];
  let entries: string[];
  try {
    entries = readdirSync(parent);
  } catch {
    return removed;
  }
  for (const e of entries) {
    if (!e.startsWith(prefix)) continue;
    const dir = join(parent, e);
    let marker: StagingMarker;
    try {
      marker = JSON.parse(readFileSync(join(dir, STAGING_MARKER), 'utf8')) as StagingMarker;
    } catch {
      continue; // no marker (or not ours): leave it alone
    }
    if (marker?.tool !== 'passbudget') continue;
    if (marker.host === hostname() && typeof marker.pid === 'number' && processAlive(marker.pid)) continue;
    try {
      rmSync(dir, { recursive: true, force: true });
      removed.push(dir);
    } catch { /* best effort: a later run tries again */ }
  }
  return removed;
}

export interface AtomicOutputOptions {
  /** Bytes the whole run is expected to write (an estimate), named in the message when the disk fills. */
  estimatedBytes?: number;
  /** How the estimate was made, a few words for that message. */
  estimateNote?: string;
}

export class AtomicOutputDir {
  readonly target: string;
  readonly staging: string;
  /** Stale staging folders of earlier killed runs removed when this one started. */
  readonly removedStale: string[];
  private readonly names: string[] = [];
  private readonly streams: WriteStream[] = [];
  private writtenBytes = 0;
  /** Errors the streams emitted, with the file each was writing. */
  private readonly streamErrors = new Map<unknown, string>();
  private committing = false;
  private done = false;

  constructor(targetDir: string, private readonly opts: AtomicOutputOptions = {}) {
    this.target = resolve(targetDir);
    const parent = dirname(this.target);
    try {
      mkdirSync(parent, { recursive: true });
    } catch (e) {
      throw this.failure(e, `create the folder ${parent}`);
    }
    this.removedStale = removeStaleStaging(this.target);
    try {
      this.staging = mkdtempSync(join(parent, `.${basename(this.target)}.partial-`));
    } catch (e) {
      throw this.failure(e, 'create a staging folder beside it');
    }
    const marker: StagingMarker = { tool: 'passbudget', pid: process.pid, host: hostname(), startedUtc: new Date().toISOString() };
    try {
      writeFileSync(join(this.staging, STAGING_MARKER), `${JSON.stringify(marker)}\n`);
    } catch (e) {
      rmSync(this.staging, { recursive: true, force: true });
      throw this.failure(e, 'write into its staging folder');
    }
  }

  /** Path inside the staging folder for `name`; remembered for the final rename. */
  path(name: string): string {
    if (!this.names.includes(name)) this.names.push(name);
    return join(this.staging, name);
  }

  writeFile(name: string, data: string | Uint8Array): void {
    try {
      writeFileSync(this.path(name), data);
    } catch (e) {
      throw this.failure(e, `write ${name}`);
    }
    this.writtenBytes += typeof data === 'string' ? Buffer.byteLength(data) : data.byteLength;
  }

  /**
   * A write stream into the staging folder. A write failure (full disk) is
   * kept rather than thrown as an unhandled 'error' event: the next `write` or
   * `end` throws it as an `OutputError`, and waiting on 'drain' or 'finish'
   * rejects with it, so the run stops at once.
   */
  stream(name: string): WriteStream {
    const s = createWriteStream(this.path(name));
    this.streams.push(s);
    let failed: unknown = null;
    s.on('error', (e) => {
      this.streamErrors.set(e, name);
      failed ??= this.failure(e, `write ${name}`);
    });
    const write = s.write.bind(s) as (...a: unknown[]) => boolean;
    const end = s.end.bind(s) as (...a: unknown[]) => WriteStream;
    s.write = ((...a: unknown[]) => {
      if (failed !== null) throw failed;
      return write(...a);
    }) as WriteStream['write'];
    s.end = ((...a: unknown[]) => {
      if (failed !== null) throw failed;
      return end(...a);
    }) as WriteStream['end'];
    return s;
  }

  /** Bytes written so far (files, and what the streams have written). */
  bytesWritten(): number {
    return this.writtenBytes + this.streams.reduce((n, s) => n + s.bytesWritten, 0);
  }

  /**
   * An error thrown while writing, as the one line a person reads: an
   * `OutputError` for file-system failures (full disk, unwritable folder),
   * the error itself otherwise.
   */
  explain(err: unknown, what = 'write the outputs'): unknown {
    if (err instanceof OutputError) return err;
    const file = this.streamErrors.get(err);
    return writeFailureCode(err) ? this.failure(err, file ? `write ${file}` : what) : err;
  }

  /** Move every staged file into the target folder (creating it) and drop the staging folder. */
  commit(): string[] {
    if (this.done) throw new Error('output already committed or discarded');
    this.committing = true;
    try {
      mkdirSync(this.target, { recursive: true });
    } catch (e) {
      throw this.failure(e, `create the folder`);
    }
    for (const name of this.names) {
      try {
        renameSync(join(this.staging, name), join(this.target, name));
      } catch (e) {
        throw this.failure(e, `move ${name} into place`);
      }
    }
    rmSync(this.staging, { recursive: true, force: true });
    this.done = true;
    return this.names.map((n) => join(this.target, n));
  }

  discard(): void {
    if (this.done) return;
    for (const s of this.streams) s.destroy();
    rmSync(this.staging, { recursive: true, force: true });
    this.done = true;
  }

  private failure(err: unknown, what: string): unknown {
    const code = writeFailureCode(err);
    if (!code) return err;
    const parts: string[] = [];
    if (code === 'ENOSPC' || code === 'EDQUOT' || code === 'EFBIG') {
      const written = this.streams ? this.bytesWritten() : 0;
      if (written > 0) parts.push(`${formatBytes(written)} written before it failed`);
      if (this.opts.estimatedBytes !== undefined && this.opts.estimatedBytes > 0) {
        parts.push(`the run needs about ${formatBytes(this.opts.estimatedBytes)}${this.opts.estimateNote ? ` ${this.opts.estimateNote}` : ''}`);
      }
      const free = freeBytes(existsSync(dirname(this.target)) ? dirname(this.target) : '/');
      if (free !== null) parts.push(`${formatBytes(free)} free there`);
    }
    const kept = this.committing ? '' : '; earlier outputs there are untouched';
    return new OutputError(`${this.target}: cannot ${what}: ${WRITE_FAILURES[code]}${parts.length ? ` (${parts.join('; ')})` : ''}${kept}`);
  }
}

/**
 * Write a few small files into `targetDir` as one atomic set (staged, then
 * renamed in); returns their final paths. Nothing is left behind on error.
 */
export function writeFilesAtomic(targetDir: string, files: ReadonlyArray<readonly [name: string, data: string | Uint8Array]>): string[] {
  const out = new AtomicOutputDir(targetDir);
  try {
    for (const [name, data] of files) out.writeFile(name, data);
    return out.commit();
  } catch (err) {
    out.discard();
    throw out.explain(err);
  }
}

/** Write one file atomically: temporary name in the same folder, then rename. */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  const abs = resolve(path);
  const tmp = join(dirname(abs), `.${basename(abs)}.${process.pid}.tmp`);
  try {
    mkdirSync(dirname(abs), { recursive: true });
    writeFileSync(tmp, data);
    renameSync(tmp, abs);
  } catch (err) {
    try { rmSync(tmp, { force: true }); } catch { /* the folder itself may be missing or a file */ }
    const code = writeFailureCode(err);
    if (!code) throw err;
    throw new OutputError(`${dirname(abs)}: cannot write ${basename(abs)}: ${WRITE_FAILURES[code]}`);
  }
}
