import type { Command } from 'commander';
import { loadScenario } from '../scenario/index.js';
import { STEPS_CHOICES, type ResolvedScenario, type StepsChoice } from '../scenario/types.js';
import { InputError } from '../errors.js';
import { STEPS_FILE } from '../output/stepsSink.js';
import { defaultOutDir, formatRunSummary, runScenario } from '../jobs/run.js';
import { estimateRunSize, formatRunSize } from '../jobs/runSize.js';
import { checkWorkers } from '../sweep/parallel.js';
import { formatBytes, freeBytes } from '../output/atomic.js';
import { printNotices } from './notices.js';
import { examples } from './examples.js';
import { dirname } from 'node:path';
import { existsSync } from 'node:fs';

/** The scenario with `exact_orbit` switched on when the flag asks for it. */
export function withExactOrbit(scenario: ResolvedScenario, flag: boolean | undefined): ResolvedScenario {
  return flag ? { ...scenario, exactOrbit: true } : scenario;
}

export function register(program: Command): void {
  program
    .command('run')
    .description('run a scenario: per-step budgets, per-pass verdicts, daily volumes, report (planning estimates)')
    .argument('<scenario>', 'scenario file (YAML or JSON)')
    .option('--out <dir>', 'output folder (default out/<scenario name>)')
    .option('--steps <format>', 'per-step table: csv (steps.csv), parquet (steps.parquet) or none (default: the scenario\'s output.steps)')
    .option('--no-steps', 'do not write a per-step table (as --steps none)')
    .option('--quiet', 'no run-size line, progress bar or summary table')
    .option('--workers <n>', 'threads that sweep: this one and n − 1 worker threads (default 1; outputs are identical for any count)')
    .option('--exact-orbit', 'SGP4 at every step instead of interpolating between SGP4 nodes (slower; a check)')
    .addHelpText('after', examples([
      ['passbudget run fixtures/demo/scenario.yaml', 'the demo: 7 days, three stations, into out/orbilux-demo/'],
      ['passbudget run my.yaml --out results/week48 --no-steps --workers 2', 'no per-step file, two worker threads'],
    ]))
    .action(async (file: string, o: { out?: string; steps?: string | boolean; quiet?: boolean; workers?: string; exactOrbit?: boolean }) => {
      const workers = o.workers === undefined ? 1 : checkWorkers(o.workers);
      const steps = o.steps === undefined ? undefined : checkStepsOption(o.steps);
      const scenario = withExactOrbit(loadScenario(file, { outDir: o.out }), o.exactOrbit);
      printNotices(scenario);
      if (!o.quiet) {
        const size = estimateRunSize(scenario, { steps });
        process.stderr.write(`passbudget: ${formatRunSize(size, scenario.window.stepS)}\n`);
        let dir = defaultOutDir(scenario, o.out);
        while (!existsSync(dir) && dirname(dir) !== dir) dir = dirname(dir);
        const free = freeBytes(dir);
        if (size.steps !== 'none' && free !== null && size.stepsBytes > free) {
          process.stderr.write(`passbudget: warning: ${STEPS_FILE[size.steps]} may not fit: about ${formatBytes(size.stepsBytes)} estimated, ${formatBytes(free)} free at ${dir} (use --steps parquet or --no-steps, a shorter window or a longer step)\n`);
        }
      }
      const result = await runScenario(scenario, { outDir: o.out, quiet: o.quiet, steps, workers });
      if (!o.quiet) process.stdout.write(`${formatRunSummary(result)}\n`);
    });
}

/** --steps FORMAT (or --no-steps: false): one of csv, parquet, none. */
export function checkStepsOption(v: string | boolean): StepsChoice {
  if (v === false) return 'none';
  if (typeof v === 'string' && (STEPS_CHOICES as readonly string[]).includes(v)) return v as StepsChoice;
  throw new InputError(`--steps: ${JSON.stringify(v)} is not a steps format (allowed: ${STEPS_CHOICES.join(', ')})`);
}
