/**
 * /api/cases: list, create, read (audited), update, status moves and the audit trail.
 * Roles (docs DESIGN.md): admins and abstractors create and edit; analysts read and verify;
 * committee members read; researchers have no case-level access. Another site's case is a 404.
 */
import type { Request } from 'express';
import { area, currentUser, parse } from '../http/route.js';
import { ctx } from '../context.js';
import { IdParamSchema } from '../../shared/sites.js';
import { CaseCreateSchema, CaseUpdateSchema } from '../../shared/registry/case.js';
import { CaseListQuerySchema } from '../../shared/registry/list.js';
import { CaseAuditQuerySchema } from '../../shared/registry/record.js';
import { StatusChangeSchema } from '../../shared/registry/status.js';
import { parseBody } from '../registry/validation.js';
import type { Actor } from '../registry/case-write.js';
import { caseAudit, changeStatus, createCase, readCase, updateCase } from './case.service.js';
import { listCases } from './case.list.js';

const a = area('/api/cases');
export const CASE_READERS = ['admin', 'abstractor', 'analyst', 'committee'] as const;
export const CASE_EDITORS = ['admin', 'abstractor'] as const;
export const CASE_STATUS_ROLES = ['admin', 'abstractor', 'analyst'] as const;

export const actorOf = (req: Request): Actor => ({ user: currentUser(req), ip: req.ip ?? null });
const services = (req: Request) => ({ ds: ctx(req).ds, config: ctx(req).config });
const caseId = (req: Request) => parse(IdParamSchema, { id: req.params.id }, 'address').id;

a.get('/', CASE_READERS, async (req) => listCases(ctx(req).ds, parseBody(CaseListQuerySchema, req.query, 'case list filter'), currentUser(req)));

a.post('/', CASE_EDITORS, async (req, res) => {
  const input = parseBody(CaseCreateSchema, req.body, 'case form');
  const out = await createCase(services(req), input, actorOf(req));
  res.status(201);
  return out;
});

a.get('/:id', CASE_READERS, async (req) => readCase(services(req), caseId(req), actorOf(req)));

a.patch('/:id', CASE_EDITORS, async (req) => updateCase(services(req), caseId(req), parseBody(CaseUpdateSchema, req.body, 'case form'), actorOf(req)));

a.post('/:id/status', CASE_STATUS_ROLES, async (req) => changeStatus(services(req), caseId(req), parseBody(StatusChangeSchema, req.body, 'status change'), actorOf(req)));

a.get('/:id/audit', CASE_READERS, async (req) => caseAudit(services(req), caseId(req), currentUser(req), parseBody(CaseAuditQuerySchema, req.query, 'audit filter')));

export const casesRouter = a;
