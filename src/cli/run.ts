import type { Command } from 'commander';
import { loadScenario } from '../scenario/index.js';
import { formatRunSummary, runScenario } from '../jobs/run.js';

export function register(program: Command): void {
  program
    .command('run')
    .description('run a scenario: per-step budgets, per-pass verdicts, daily volumes, report (planning estimates)')
    .argument('<scenario>', 'scenario file (YAML or JSON)')
    .option('--out <dir>', 'output folder (default out/<scenario name>)')
    .option('--no-steps', 'do not write steps.csv')
    .option('--quiet', 'no progress bar and no summary table')
    .action(async (file: string, o: { out?: string; steps?: boolean; quiet?: boolean }) => {
      const scenario = loadScenario(file, { outDir: o.out });
      const result = await runScenario(scenario, { outDir: o.out, quiet: o.quiet, steps: o.steps === false ? false : undefined });
      if (!o.quiet) process.stdout.write(`${formatRunSummary(result)}\n`);
    });
}
