/**
 * Atomic output: every file of a run is written under a temporary name in a
 * staging folder beside the target, and only renamed into the target folder
 * once the whole run has succeeded. A failed or interrupted run leaves the
 * target folder as it was (a stale staging folder at most, removed on error).
 */
import { mkdirSync, mkdtempSync, renameSync, rmSync, writeFileSync, createWriteStream, type WriteStream } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';

export class AtomicOutputDir {
  readonly target: string;
  readonly staging: string;
  private readonly names: string[] = [];
  private done = false;

  constructor(targetDir: string) {
    this.target = resolve(targetDir);
    const parent = dirname(this.target);
    mkdirSync(parent, { recursive: true });
    this.staging = mkdtempSync(join(parent, `.${basename(this.target)}.partial-`));
  }

  /** Path inside the staging folder for `name`; remembered for the final rename. */
  path(name: string): string {
    if (!this.names.includes(name)) this.names.push(name);
    return join(this.staging, name);
  }

  writeFile(name: string, data: string | Uint8Array): void {
    writeFileSync(this.path(name), data);
  }

  stream(name: string): WriteStream {
    return createWriteStream(this.path(name));
  }

  /** Move every staged file into the target folder (creating it) and drop the staging folder. */
  commit(): string[] {
    if (this.done) throw new Error('output already committed or discarded');
    mkdirSync(this.target, { recursive: true });
    for (const name of this.names) renameSync(join(this.staging, name), join(this.target, name));
    rmSync(this.staging, { recursive: true, force: true });
    this.done = true;
    return this.names.map((n) => join(this.target, n));
  }

  discard(): void {
    if (this.done) return;
    rmSync(this.staging, { recursive: true, force: true });
    this.done = true;
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
    throw err;
  }
}

/** Write one file atomically: temporary name in the same folder, then rename. */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  const abs = resolve(path);
  mkdirSync(dirname(abs), { recursive: true });
  const tmp = join(dirname(abs), `.${basename(abs)}.${process.pid}.tmp`);
  try {
    writeFileSync(tmp, data);
    renameSync(tmp, abs);
  } catch (err) {
    rmSync(tmp, { force: true });
    throw err;
  }
}
