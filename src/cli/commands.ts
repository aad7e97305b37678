import type { Command } from 'commander';

/** Each command file exports a `register(program)`; add new commands here. */
export type Register = (program: Command) => void;

export const commands: Register[] = [];
