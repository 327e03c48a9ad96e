/**
 * Who may call each API route, written out from the product's role table (DESIGN.md, "Roles at
 * a glance") independently of the route declarations the server's guard reads. Every route the
 * router declares must appear here: a new route without a row fails role-matrix.test.ts.
 *
 * Values: 'public' (no sign-in), 'signed-in' (any role), or the roles allowed. 'chair' stands
 * for a committee member flagged as chair (admins always pass where the chair passes).
 */
export type Who = 'admin' | 'abstractor' | 'analyst' | 'committee' | 'chair' | 'researcher';
export type Rule = 'public' | 'signed-in' | readonly Who[];

export interface MatrixRow {
  rule: Rule;
  /** Do not call this route as an allowed user in the generic sweep (it would end the session, etc.). */
  skipAllowed?: boolean;
}

const ALL_CASE_READERS = ['admin', 'abstractor', 'analyst', 'committee', 'chair'] as const;
const CASE_WRITERS = ['admin', 'abstractor'] as const;

export const MATRIX: Record<string, MatrixRow> = {
  // Foundation
  'GET /api/health': { rule: 'public' },
  'GET /api/auth/csrf': { rule: 'public' },
  'POST /api/auth/login': { rule: 'public', skipAllowed: true },
  'POST /api/auth/logout': { rule: 'signed-in', skipAllowed: true },
  'GET /api/auth/me': { rule: 'signed-in' },
  'POST /api/auth/password-reset': { rule: 'public', skipAllowed: true },
  'POST /api/auth/password-reset/confirm': { rule: 'public' },
  'POST /api/auth/invitation/accept': { rule: 'public' },
  'POST /api/auth/totp/setup': { rule: 'signed-in', skipAllowed: true },
  'POST /api/auth/totp/confirm': { rule: 'signed-in' },
  'GET /api/users': { rule: ['admin'] },
  'GET /api/users/:id': { rule: ['admin'] },
  'POST /api/users': { rule: ['admin'] },
  'PATCH /api/users/:id': { rule: ['admin'] },
  'POST /api/users/:id/password-reset': { rule: ['admin'] },
  'GET /api/sites': { rule: ALL_CASE_READERS },
  'POST /api/sites': { rule: ['admin'] },
  'PATCH /api/sites/:id': { rule: ['admin'] },
  'POST /api/sites/:id/units': { rule: ['admin'] },
  'PATCH /api/sites/:id/units/:unitId': { rule: ['admin'] },
  'GET /api/mail': { rule: ['admin'] },
  // Registry (DESIGN.md: cases of own sites read by admin, abstractor, analyst, committee; created,
  // edited and imported by admin and abstractor; verified by admin, abstractor, analyst; researchers never).
  'GET /api/cases': { rule: ALL_CASE_READERS },
  'POST /api/cases': { rule: CASE_WRITERS },
  'GET /api/cases/:id': { rule: ALL_CASE_READERS },
  'PATCH /api/cases/:id': { rule: CASE_WRITERS },
  'POST /api/cases/:id/status': { rule: ['admin', 'abstractor', 'analyst'] },
  'GET /api/cases/:id/audit': { rule: ALL_CASE_READERS },
  'GET /api/cases/:id/therapy': { rule: ALL_CASE_READERS },
  'POST /api/cases/:id/therapy': { rule: CASE_WRITERS },
  'PATCH /api/cases/:id/therapy/:episodeId': { rule: CASE_WRITERS },
  'DELETE /api/cases/:id/therapy/:episodeId': { rule: CASE_WRITERS },
  'GET /api/cases/:id/outcomes': { rule: ALL_CASE_READERS },
  'POST /api/cases/:id/outcomes': { rule: CASE_WRITERS },
  'PATCH /api/cases/:id/outcomes/:eventId': { rule: CASE_WRITERS },
  'DELETE /api/cases/:id/outcomes/:eventId': { rule: CASE_WRITERS },
  // Re-applying a changed definition is abstraction work; analysts may review the differences.
  'GET /api/outcomes/reevaluation': { rule: ['admin', 'abstractor', 'analyst'] },
  'POST /api/outcomes/reevaluation': { rule: CASE_WRITERS },
  // The worklist serves abstractors and the analysts who verify.
  'GET /api/worklist': { rule: ['admin', 'abstractor', 'analyst'] },
  'GET /api/dictionary': { rule: 'signed-in' },
  'GET /api/jobs/:id': { rule: 'signed-in' },
  'POST /api/jobs/:id/cancel': { rule: 'signed-in' },
  'POST /api/jobs/:id/retry': { rule: 'signed-in' },
  // Bulk import (DESIGN.md: cases create, edit, import — admin and abstractor).
  'GET /api/imports/template': { rule: CASE_WRITERS },
  'GET /api/imports/presets': { rule: CASE_WRITERS },
  'POST /api/imports/presets': { rule: CASE_WRITERS },
  'DELETE /api/imports/presets/:id': { rule: CASE_WRITERS },
  'GET /api/imports': { rule: CASE_WRITERS },
  'POST /api/imports': { rule: CASE_WRITERS },
  'GET /api/imports/:id': { rule: CASE_WRITERS },
  'POST /api/imports/:id/dry-run': { rule: CASE_WRITERS },
  'POST /api/imports/:id/commit': { rule: CASE_WRITERS },
  'POST /api/imports/:id/abandon': { rule: CASE_WRITERS },
  'GET /api/imports/:id/problems': { rule: CASE_WRITERS },
  'GET /api/imports/:id/problems.xlsx': { rule: CASE_WRITERS },
  // Research exports (DESIGN.md: export requests — admin approves; analyst and researcher request; abstractor and committee no).
  'GET /api/exports/variables': { rule: ['admin', 'analyst', 'researcher'] },
  'POST /api/exports': { rule: ['analyst', 'researcher'] },
  'GET /api/exports': { rule: ['admin', 'analyst', 'researcher'] },
  'GET /api/exports/audit': { rule: ['admin'] },
  'GET /api/exports/audit.csv': { rule: ['admin'] },
  'GET /api/exports/:id': { rule: ['admin', 'analyst', 'researcher'] },
  'GET /api/exports/:id/risk': { rule: ['admin'] },
  'POST /api/exports/:id/decision': { rule: ['admin'] },
  // The file: only its requester (a researcher or analyst); the approving admin does not download it.
  'GET /api/exports/:id/file': { rule: ['analyst', 'researcher'] },
  // Cohorts and comparisons (DESIGN.md: every role; researchers get aggregates only, suppressed).
  'GET /api/analysis/rates': { rule: ['admin', 'abstractor', 'analyst', 'committee', 'chair', 'researcher'] },
  'GET /api/analysis/cohort': { rule: ['admin', 'abstractor', 'analyst', 'committee', 'chair', 'researcher'] },
  'GET /api/analysis/compare': { rule: ['admin', 'abstractor', 'analyst', 'committee', 'chair', 'researcher'] },
  'GET /api/analysis/series': { rule: ['admin', 'abstractor', 'analyst', 'committee', 'chair', 'researcher'] },
  'GET /api/analysis/funnel': { rule: ['admin', 'abstractor', 'analyst', 'committee', 'chair', 'researcher'] },
  'GET /api/analysis/export/:view': { rule: ['admin', 'abstractor', 'analyst', 'committee', 'chair', 'researcher'] },
  'GET /api/cohorts': { rule: ['admin', 'abstractor', 'analyst', 'committee', 'chair', 'researcher'] },
  'POST /api/cohorts': { rule: ['admin', 'abstractor', 'analyst', 'committee', 'chair', 'researcher'] },
  'GET /api/cohorts/:id': { rule: ['admin', 'abstractor', 'analyst', 'committee', 'chair', 'researcher'] },
  'PATCH /api/cohorts/:id': { rule: ['admin', 'abstractor', 'analyst', 'committee', 'chair', 'researcher'] },
  'DELETE /api/cohorts/:id': { rule: ['admin', 'abstractor', 'analyst', 'committee', 'chair', 'researcher'] },
  // Committee review (DESIGN.md: network aggregates with site names for analysts and the committee;
  // month close, publish and sign-off for the chair only, admins always; members record reviews; measures' settings admin).
  'GET /api/measures': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'GET /api/measures/:key': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'PATCH /api/measures/:key': { rule: ['admin'] },
  'GET /api/measures/:key/chart': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'GET /api/measures/:key/g-chart': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'GET /api/committee/annotations': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'POST /api/committee/annotations': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'DELETE /api/committee/annotations/:id': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'GET /api/committee/months': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'GET /api/committee/months/:month': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'POST /api/committee/months/:month/close': { rule: ['chair'] },
  'POST /api/committee/months/:month/reopen': { rule: ['chair'] },
  'POST /api/committee/months/:month/publish': { rule: ['chair'] },
  'GET /api/committee/months/:month/packet': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'GET /api/committee/months/:month/packet/file': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'GET /api/reviews': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'GET /api/reviews/actions': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'PATCH /api/reviews/actions/:id': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'GET /api/reviews/members': { rule: ['admin', 'committee', 'chair'] },
  'GET /api/reviews/:month': { rule: ['admin', 'analyst', 'committee', 'chair'] },
  'PUT /api/reviews/:month/findings/:key': { rule: ['admin', 'committee', 'chair'] },
  'POST /api/reviews/:month/actions': { rule: ['admin', 'committee', 'chair'] },
  'POST /api/reviews/:month/sign-off': { rule: ['chair'] },
  // Data quality (DESIGN.md: case-level views for those who read cases of their sites; uploads by case writers;
  // samples and consistency runs by admins and analysts; blind entry and adjudication (a case change) by case writers).
  'GET /api/quality/completeness': { rule: ALL_CASE_READERS },
  'GET /api/quality/capture': { rule: ALL_CASE_READERS },
  'POST /api/quality/capture/theatre-lists': { rule: CASE_WRITERS },
  'GET /api/quality/reabstraction/abstractors': { rule: ['admin', 'analyst'] },
  'GET /api/quality/reabstraction/samples': { rule: ['admin', 'abstractor', 'analyst'] },
  'POST /api/quality/reabstraction/samples': { rule: ['admin', 'analyst'] },
  'GET /api/quality/reabstraction/samples/:id/blind': { rule: CASE_WRITERS },
  'POST /api/quality/reabstraction/items/:id': { rule: CASE_WRITERS },
  'GET /api/quality/reabstraction/samples/:id/report': { rule: ['admin', 'abstractor', 'analyst'] },
  'GET /api/quality/reabstraction/samples/:id/report.xlsx': { rule: ['admin', 'abstractor', 'analyst'] },
  'POST /api/quality/reabstraction/items/:id/adjudications': { rule: CASE_WRITERS },
  'POST /api/quality/checks': { rule: ['admin', 'analyst'] },
  'GET /api/quality/findings': { rule: ['admin', 'abstractor', 'analyst'] },
  'POST /api/quality/findings/:id/review': { rule: ['admin', 'abstractor', 'analyst'] },
};

export { ALL_CASE_READERS, CASE_WRITERS };
