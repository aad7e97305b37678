import type { Command } from 'commander';
import { loadScenario } from '../scenario/index.js';
import { formatRunSummary } from '../jobs/run.js';
import { planScenario } from '../jobs/plan.js';
import { formatPlanSummary } from '../plan/outputs.js';
import { checkWorkers } from '../sweep/parallel.js';
import { printNotices } from './notices.js';
import { examples } from './examples.js';
import { withExactOrbit } from './run.js';

export function register(program: Command): void {
  program
    .command('plan')
    .description('plan contacts: which passes each satellite takes when satellites share station antennas, the volume each decision buys and its cost (the run\'s files too)')
    .argument('<scenario>', 'scenario file (YAML or JSON), with antennas, booking and plan terms where wanted')
    .option('--out <dir>', 'output folder (default out/<scenario name>)')
    .option('--no-steps', 'do not write steps.csv')
    .option('--quiet', 'no progress bar or summary tables')
    .option('--workers <n>', 'threads that sweep (default 1; outputs are identical for any count)')
    .option('--exact-orbit', 'SGP4 at every step instead of interpolating between SGP4 nodes (slower; a check)')
    .addHelpText('after', examples([
      ['passbudget plan fixtures/constellation/scenario.yaml', 'six invented cubesats over four stations with one dish each, one rented, into out/velka-constellation/'],
      ['passbudget plan my.yaml --out results/plan --no-steps --workers 2', 'no per-step file, two threads'],
    ]))
    .action(async (file: string, o: { out?: string; steps?: boolean; quiet?: boolean; workers?: string; exactOrbit?: boolean }) => {
      const workers = o.workers === undefined ? 1 : checkWorkers(o.workers);
      const scenario = withExactOrbit(loadScenario(file, { outDir: o.out }), o.exactOrbit);
      printNotices(scenario);
      const result = await planScenario(scenario, { outDir: o.out, quiet: o.quiet, steps: o.steps === false ? false : undefined, workers });
      if (!o.quiet) process.stdout.write(`${formatRunSummary(result)}\n\n${formatPlanSummary(result.plan)}\n`);
    });
}
