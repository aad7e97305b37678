import type { Command } from 'commander';
import { loadScenario } from '../scenario/index.js';
import { formatRunSummary, runScenario } from '../jobs/run.js';
import { checkWorkers } from '../sweep/parallel.js';
import type { ResolvedScenario } from '../scenario/types.js';

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
    .option('--no-steps', 'do not write steps.csv')
    .option('--quiet', 'no progress bar and no summary table')
    .option('--workers <n>', 'worker threads for the sweep (default 1; outputs are identical for any count)')
    .option('--exact-orbit', 'SGP4 at every step instead of interpolating between SGP4 nodes (slower; a check)')
    .action(async (file: string, o: { out?: string; steps?: boolean; quiet?: boolean; workers?: string; exactOrbit?: boolean }) => {
      const workers = o.workers === undefined ? 1 : checkWorkers(o.workers);
      const scenario = withExactOrbit(loadScenario(file, { outDir: o.out }), o.exactOrbit);
      const result = await runScenario(scenario, { outDir: o.out, quiet: o.quiet, steps: o.steps === false ? false : undefined, workers });
      if (!o.quiet) process.stdout.write(`${formatRunSummary(result)}\n`);
    });
}
