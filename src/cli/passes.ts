import type { Command } from 'commander';

/** Not yet wired. */
export function register(_program: Command): void {}
