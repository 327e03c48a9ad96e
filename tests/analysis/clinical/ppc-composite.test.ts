/**
 * The "any PPC" composite. Its components are those listed by Canet J et al., Anesthesiology
 * 2010;113:1338-50 and Jammer I et al., Eur J Anaesthesiol 2015;32:88-105 (TRADE.md: checked):
 * respiratory infection, respiratory failure, bronchospasm, atelectasis, pleural effusion,
 * pneumothorax, aspiration pneumonitis. Reintubation and ARDS are outside it, and the statuses
 * that count are complete, verified and locked (issue 3).
 */
import { describe, expect, it } from 'vitest';
import { AnalysisInputError } from '../../../analysis/errors.js';
import {
  ANY_PPC_COMPONENTS,
  PPC_REPORTED_SEPARATELY,
  countsInAnalysis,
  hasAnyPpc,
  isAnyPpcComponent,
} from '../../../analysis/clinical/ppc-composite.js';
import { CASE_STATUSES, PPC_EVENT_TYPES, type CaseStatus, type PpcEventType } from '../../../shared/clinical/codes.js';

const PUBLISHED_COMPOSITE = [
  'respiratory-infection',
  'respiratory-failure',
  'bronchospasm',
  'atelectasis',
  'pleural-effusion',
  'pneumothorax',
  'aspiration-pneumonitis',
];

describe('any PPC composite', () => {
  it('when the components are listed, then they are exactly the seven published ones', () => {
    expect([...ANY_PPC_COMPONENTS].sort()).toEqual([...PUBLISHED_COMPOSITE].sort());
  });

  it('when every event type is classified, then each is either in the composite or reported separately', () => {
    for (const t of PPC_EVENT_TYPES) {
      const inside = isAnyPpcComponent(t);
      expect(inside).toBe(PUBLISHED_COMPOSITE.includes(t));
      expect(inside).toBe(!(PPC_REPORTED_SEPARATELY as readonly string[]).includes(t));
    }
  });

  it('when a case has only reintubation and ARDS, then it has no PPC in the composite', () => {
    expect(hasAnyPpc([{ type: 'reintubation' }, { type: 'ards' }])).toBe(false);
  });

  it('when a case has reintubation and a pneumothorax, then it has a PPC', () => {
    expect(hasAnyPpc([{ type: 'reintubation' }, { type: 'pneumothorax' }])).toBe(true);
  });

  it('when a case has no events, then no PPC', () => {
    expect(hasAnyPpc([])).toBe(false);
  });

  it('when an event type is unknown, then it throws naming the event', () => {
    expect(() => hasAnyPpc([{ type: 'hiccups' as PpcEventType }])).toThrow(AnalysisInputError);
    expect(() => hasAnyPpc([{ type: 'hiccups' as PpcEventType }])).toThrow(/events\[0\]\.type/);
  });
});

describe('countsInAnalysis', () => {
  it.each([
    ['draft', false],
    ['complete', true],
    ['verified', true],
    ['locked', true],
    ['withdrawn', false],
  ] as const)('when the status is %s, then counts is %s', (status, counts) => {
    expect(countsInAnalysis(status)).toBe(counts);
  });

  it('when every status is checked, then only the three named ones count', () => {
    expect(CASE_STATUSES.filter((s) => countsInAnalysis(s))).toEqual(['complete', 'verified', 'locked']);
  });

  it('when the status is unknown, then it throws', () => {
    expect(() => countsInAnalysis('archived' as CaseStatus)).toThrow(AnalysisInputError);
  });
});
