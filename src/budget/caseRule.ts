/**
 * The per-step rule from C/N0 to what a weather case delivers: Es/N0, Eb/N0,
 * margin, usable, mode and information rate (PHYSICS.md §10 and §12). Pure
 * and browser-clean: the budget engine applies it to every case column, and
 * the report's what-if panel applies the same code to the C/N0 it carries.
 *   fixed:    Eb/N0 = C/N0 − 10 log10 R_b, margin = Eb/N0 − (Eb/N0)_req − L_impl,
 *             usable when margin ≥ required margin, rate R_b when usable;
 *   adaptive: Es/N0 = C/N0 − 10 log10 R_s, the mode table's choice for
 *             Es/N0 − L_impl (modcod.ts), margin against that mode's required Es/N0.
 */
import { adaptiveModeTable, type AdaptiveModeTable } from '../models/modcod.js';
import type { LinkSpec } from './types.js';

export interface CaseRule {
  adaptive: boolean;
  rsDB: number;
  rbDB: number;
  bitRateBps: number;
  requiredEbN0DB: number;
  implementationLossDB: number;
  requiredMarginDB: number;
  modeTable: AdaptiveModeTable | null;
  modeReq: Float64Array;
  modeEffDB: Float64Array;
  modeRates: Float64Array;
  /** Mode whose required Es/N0 is lowest (the margin's reference when none fits). */
  lowestIndex: number;
}

/** The columns the rule writes (a CaseColumns has them all). */
export interface CaseRuleColumns {
  cOverN0DBHz: Float64Array;
  esN0DB: Float64Array;
  ebN0DB: Float64Array;
  requiredEbN0DB: Float64Array;
  marginDB: Float64Array;
  usable: Uint8Array;
  mode: Int16Array;
  informationRateBps: Float64Array;
}

/** The rule's constants for a link's modulation, coding, implementation loss and required margin. */
export function createCaseRule(link: Pick<LinkSpec, 'modcod' | 'implementationLossDB' | 'requiredMarginDB'>): CaseRule {
  const mc = link.modcod;
  const base = { implementationLossDB: link.implementationLossDB, requiredMarginDB: link.requiredMarginDB };
  if (mc.kind === 'fixed') {
    return {
      ...base, adaptive: false, bitRateBps: mc.bitRateBps, requiredEbN0DB: mc.requiredEbN0DB,
      rbDB: 10 * Math.log10(mc.bitRateBps), rsDB: 10 * Math.log10(mc.bitRateBps / mc.bitsPerSymbol),
      modeTable: null, modeReq: new Float64Array(0), modeEffDB: new Float64Array(0), modeRates: new Float64Array(0), lowestIndex: 0,
    };
  }
  const modes = mc.modes;
  let lowestIndex = 0;
  modes.forEach((m, i) => { if (m.requiredEsN0DB < modes[lowestIndex].requiredEsN0DB) lowestIndex = i; });
  return {
    ...base, adaptive: true, bitRateBps: NaN, requiredEbN0DB: NaN, rbDB: NaN, rsDB: 10 * Math.log10(mc.symbolRateBaud),
    modeTable: adaptiveModeTable(modes, link.requiredMarginDB),
    modeReq: Float64Array.from(modes, (m) => m.requiredEsN0DB),
    modeEffDB: Float64Array.from(modes, (m) => 10 * Math.log10(m.efficiencyBitsPerSymbol)),
    modeRates: Float64Array.from(modes, (m) => mc.symbolRateBaud * m.efficiencyBitsPerSymbol),
    lowestIndex,
  };
}

/**
 * Entries 0 … n−1 of c.cOverN0DBHz (dB-Hz) into the other columns. With
 * `withRequired` also the required Eb/N0 column.
 */
export function applyCaseRule(r: CaseRule, c: CaseRuleColumns, n: number, withRequired: boolean): void {
  const rs = r.rsDB * 1, rb = r.rbDB * 1, im = r.implementationLossDB * 1, rm = r.requiredMarginDB * 1, br = r.bitRateBps * 1;
  const cn0Col = c.cOverN0DBHz, esCol = c.esN0DB, ebCol = c.ebN0DB;
  const reqCol = c.requiredEbN0DB, marginCol = c.marginDB, usableCol = c.usable, modeCol = c.mode, rateCol = c.informationRateBps;
  if (!r.adaptive) {
    const req = r.requiredEbN0DB * 1;
    for (let i = 0; i < n; i++) {
      const cn0 = cn0Col[i];
      esCol[i] = cn0 - rs;
      const ebn0 = cn0 - rb;
      ebCol[i] = ebn0;
      const margin = ebn0 - req - im;
      marginCol[i] = margin;
      const usable = margin >= rm;
      usableCol[i] = usable ? 1 : 0;
      modeCol[i] = -1;
      rateCol[i] = usable ? br : 0;
    }
    if (withRequired) reqCol.fill(req, 0, n);
    return;
  }
  for (let i = 0; i < n; i++) esCol[i] = cn0Col[i] - rs;
  // Effective Es/N0 (after the implementation loss) into the margin column, then the mode chosen for it.
  for (let i = 0; i < n; i++) marginCol[i] = esCol[i] - im;
  r.modeTable!.chooseColumn(marginCol, n, modeCol);
  const modeReq = r.modeReq, modeEffDB = r.modeEffDB, modeRates = r.modeRates, lowest = r.lowestIndex;
  for (let i = 0; i < n; i++) {
    const effective = marginCol[i];
    const chosen = modeCol[i];
    const mi = chosen >= 0 ? chosen : lowest;
    const req = modeReq[mi];
    const effDB = modeEffDB[mi];
    marginCol[i] = effective - req;
    // Eb/N0 = Es/N0 − 10 log10(information bits per symbol) of the mode in use.
    ebCol[i] = esCol[i] - effDB;
    reqCol[i] = req - effDB;
    usableCol[i] = chosen >= 0 ? 1 : 0;
    rateCol[i] = chosen >= 0 ? modeRates[chosen] : 0;
  }
}
