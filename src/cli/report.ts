import type { Command } from 'commander';
import { rebuildReportWithNotes } from '../jobs/report.js';
import { examples } from './examples.js';

export function register(program: Command): void {
  program
    .command('report')
    .description('rebuild report.html from an existing output folder of passbudget run')
    .argument('<dir>', 'output folder (holds summary.json, passes.json, daily.csv; steps.csv or steps.parquet, mask.csv, rate.csv when present)')
    .addHelpText('after', examples([
      ['passbudget report out/orbilux-demo', 'report.html again from the files of a run (after passbudget mask or rate, with their charts)'],
    ]))
    .action(async (dir: string) => {
      const { file, whatIfMissing } = await rebuildReportWithNotes(dir);
      if (whatIfMissing) process.stderr.write(`${whatIfMissing}\n`);
      process.stdout.write(`report written: ${file}\n`);
    });
}
