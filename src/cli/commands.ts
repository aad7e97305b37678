import type { Command } from 'commander';
import { register as passes } from './passes.js';
import { register as explain } from './explain.js';
import { register as run } from './run.js';
import { register as plan } from './plan.js';
import { register as mask } from './mask.js';
import { register as rate } from './rate.js';
import { register as schema } from './schema.js';
import { register as report } from './report.js';
import { register as age } from './age.js';

/** Each command file exports a `register(program)`; add new commands here. */
export type Register = (program: Command) => void;

export const commands: Register[] = [passes, explain, run, plan, mask, rate, schema, report, age];
