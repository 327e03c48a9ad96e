/**
 * Code lists checked against the published classifications they follow:
 * - ASA physical status I–VI with an E modifier (American Society of Anesthesiologists; TRADE.md);
 * - Clavien–Dindo grades I, II, IIIa, IIIb, IVa, IVb, V (Dindo D et al., Ann Surg 2004;240:205-13);
 * - ARISCAT incision classes peripheral, upper abdominal, intrathoracic (Canet J et al.,
 *   Anesthesiology 2010;113:1338-50); lower abdominal is peripheral there;
 * - the PPC types of issue 3 and the case statuses of the abstraction workflow.
 */
import { describe, expect, it } from 'vitest';
import {
  ARISCAT_INCISIONS,
  ASA_CLASSES,
  ASA_CLASS_LABELS,
  CASE_STATUSES,
  CLAVIEN_DINDO_GRADES,
  CLAVIEN_DINDO_LABELS,
  INCISION_SITES,
  INCISION_SITE_LABELS,
  INCISION_SITE_TO_ARISCAT,
  OBSERVATION_KINDS,
  OBSERVATION_KIND_LABELS,
  PPC_EVENT_TYPES,
  PROCEDURE_CATEGORIES,
  PROCEDURE_CATEGORY_LABELS,
  THERAPY_MODALITIES,
  THERAPY_MODALITY_LABELS,
} from '../../../shared/clinical/codes.js';

describe('code lists', () => {
  it('when ASA classes are listed, then they are I to VI', () => {
    expect(ASA_CLASSES).toEqual(['I', 'II', 'III', 'IV', 'V', 'VI']);
    expect(Object.keys(ASA_CLASS_LABELS)).toEqual([...ASA_CLASSES]);
  });

  it('when Clavien–Dindo grades are listed, then they are the seven of Dindo 2004', () => {
    expect(CLAVIEN_DINDO_GRADES).toEqual(['I', 'II', 'IIIa', 'IIIb', 'IVa', 'IVb', 'V']);
    expect(Object.keys(CLAVIEN_DINDO_LABELS)).toEqual([...CLAVIEN_DINDO_GRADES]);
  });

  it('when the ARISCAT incision classes are listed, then they are the three of Canet 2010', () => {
    expect(ARISCAT_INCISIONS).toEqual(['peripheral', 'upper-abdominal', 'intrathoracic']);
  });

  it('when every incision site is mapped, then each has a label and one ARISCAT class; lower abdominal is peripheral', () => {
    for (const s of INCISION_SITES) {
      expect(INCISION_SITE_LABELS[s]).toMatch(/\S/);
      expect(ARISCAT_INCISIONS).toContain(INCISION_SITE_TO_ARISCAT[s]);
    }
    expect(INCISION_SITE_TO_ARISCAT['lower-abdominal']).toBe('peripheral');
  });

  it('when the PPC types are listed, then they are the nine of issue 3', () => {
    expect([...PPC_EVENT_TYPES].sort()).toEqual(
      [
        'atelectasis',
        'respiratory-infection',
        'respiratory-failure',
        'reintubation',
        'bronchospasm',
        'aspiration-pneumonitis',
        'pleural-effusion',
        'pneumothorax',
        'ards',
      ].sort(),
    );
  });

  it('when case statuses are listed, then they follow the workflow order', () => {
    expect(CASE_STATUSES).toEqual(['draft', 'complete', 'verified', 'locked', 'withdrawn']);
  });

  it('when procedure categories, modalities and observation kinds are listed, then each has a label', () => {
    expect(PROCEDURE_CATEGORIES.length).toBeGreaterThanOrEqual(12);
    for (const c of PROCEDURE_CATEGORIES) expect(PROCEDURE_CATEGORY_LABELS[c]).toMatch(/\S/);
    for (const m of THERAPY_MODALITIES) expect(THERAPY_MODALITY_LABELS[m]).toMatch(/\S/);
    for (const k of OBSERVATION_KINDS) expect(OBSERVATION_KIND_LABELS[k]).toMatch(/\S/);
  });
});
