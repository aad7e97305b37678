import type { Command } from 'commander';
import { loadScenario } from '../scenario/index.js';
import { formatRunSummary, runScenario } from '../jobs/run.js';
import { checkWorkers } from '../sweep/parallel.js';

export function register(program: Command): void {
  program
    .command('run')
    .description('run a scenario: per-step budgets, per-pass verdicts, daily volumes, report (planning estimates)')
    .argument('<scenario>', 'scenario file (YAML or JSON)')
    .option('--out <dir>', 'output folder (default out/<scenario name>)')
    .option('--no-steps', 'do not write steps.csv')
    .option('--quiet', 'no progress bar and no summary table')
    .option('--workers <n>', 'worker threads for the sweep (default 1; outputs are identical for any count)')
    .action(async (file: string, o: { out?: string; steps?: boolean; quiet?: boolean; workers?: string }) => {
      const workers = o.workers === undefined ? 1 : checkWorkers(o.workers);
      const scenario = loadScenario(file, { outDir: o.out });
      const result = await runScenario(scenario, { outDir: o.out, quiet: o.quiet, steps: o.steps === false ? false : undefined, workers });
      if (!o.quiet) process.stdout.write(`${formatRunSummary(result)}\n`);
    });
}
