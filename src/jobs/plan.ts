/**
 * `planScenario`: the run (its files keep their meaning: unconstrained) with
 * the sweep keeping each pass-link's volume profile, then the contact plan
 * (src/plan/) and its files beside the run's: contacts.csv, contacts.json,
 * contacts.ics, plan.json, and the plan section of report.html. Atomic with
 * the rest: nothing is renamed into place unless everything succeeded.
 */
import { csvText } from '../output/csv.js';
import { jsonText } from '../output/json.js';
import type { ResolvedScenario } from '../scenario/types.js';
import { InputError } from '../errors.js';
import { profileGridS } from '../plan/candidates.js';
import { planContacts, type ContactPlan } from '../plan/plan.js';
import { contactColumns, contactRows, contactsCalendar, contactsJson, planJson } from '../plan/outputs.js';
import { planSection } from '../plan/report.js';
import { runScenario, type RunOptions, type RunResult } from './run.js';

export interface PlanResult extends RunResult { plan: ContactPlan }

export async function planScenario(scenario: ResolvedScenario, opts: Omit<RunOptions, 'extra'> = {}): Promise<PlanResult> {
  if (!scenario.plan) throw new InputError(`${scenario.file}: no contact-planning terms resolved (allowed: a scenario loaded by passbudget)`);
  const withProfiles: ResolvedScenario = { ...scenario, volumeProfileGridS: profileGridS(scenario) };
  let plan: ContactPlan | null = null;
  const result = await runScenario(withProfiles, {
    ...opts,
    extra: async (pipeline) => {
      plan = await planContacts(withProfiles, pipeline);
      return {
        files: [
          { name: 'contacts.csv', text: await csvText(contactColumns(scenario), contactRows(plan)) },
          { name: 'contacts.json', text: `${JSON.stringify(contactsJson(scenario, plan), null, 2)}\n` },
          { name: 'contacts.ics', text: contactsCalendar(scenario, plan) },
          { name: 'plan.json', text: jsonText(planJson(scenario, plan)) },
        ],
        reportSections: [planSection(scenario, plan)],
      };
    },
  });
  return { ...result, plan: plan as unknown as ContactPlan };
}
