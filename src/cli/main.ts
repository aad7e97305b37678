#!/usr/bin/env node
/**
 * passbudget command line: commander wiring only. Each command lives in its
 * own file and calls the library. Exit codes: 0 success, 2 bad input or
 * usage, 1 internal error.
 */
import { realpathSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Command, CommanderError } from 'commander';
import { InputError, OutputError } from '../errors.js';
import { examples } from './examples.js';
import { softwareVersions } from '../jobs/outputs.js';
import { commands } from './commands.js';

export async function main(argv: string[]): Promise<number> {
  const program = new Command('passbudget')
    .description('Pass-by-pass link margin simulator for satellite radio links (planning estimates)')
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s) })
    .showHelpAfterError(false)
    .version(ownVersion(), '-V, --version', 'print the passbudget version');
  for (const register of commands) register(program);
  program.addHelpText('after', examples([
    ['passbudget run fixtures/demo/scenario.yaml', 'the demo scenario: budgets, passes, daily volumes and report in out/orbilux-demo/'],
    ['passbudget passes --elements fixtures/demo/orbilux-3.tle --station 68.40,17.25,120', 'two days of passes over one station'],
  ]));
  try {
    await program.parseAsync(argv, { from: 'user' });
    return 0;
  } catch (err) {
    return reportError(err);
  }
}

export function reportError(err: unknown): number {
  if (err instanceof CommanderError) {
    // commander already printed its one-line message; help/version exit 0.
    return err.exitCode === 0 || err.code === 'commander.helpDisplayed' || err.code === 'commander.version' ? 0 : 2;
  }
  if (err instanceof InputError) {
    process.stderr.write(`passbudget: ${err.message}\n`);
    return 2;
  }
  if (err instanceof OutputError) {
    process.stderr.write(`passbudget: ${err.message}\n`);
    return 1;
  }
  const e = err as Error;
  process.stderr.write(`passbudget: internal error: ${e?.message ?? String(err)}\n`);
  if (process.env.PASSBUDGET_DEBUG) process.stderr.write(`${e?.stack ?? ''}\n`);
  return 1;
}

function ownVersion(): string {
  return softwareVersions().find((s) => s.name === 'passbudget')?.version ?? 'unknown';
}

function invokedDirectly(): boolean {
  if (!process.argv[1]) return false;
  try {
    return realpathSync(process.argv[1]) === realpathSync(fileURLToPath(import.meta.url));
  } catch {
    return false;
  }
}
if (invokedDirectly()) {
  main(process.argv.slice(2)).then((code) => { process.exitCode = code; });
}
