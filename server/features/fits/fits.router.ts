import type { Request } from 'express';
import { z } from 'zod';
import { errorBodySchema } from '@shared/schemas/common';
import {
  checkBodySchema,
  submitBodySchema,
  checkQueueSchema,
  fitAuditSchema,
  fitBodySchema,
  fitListSchema,
  fitPatchSchema,
  fitSchema,
  reducedRecordSchema,
  wellKSchema,
} from '@shared/schemas/fits';
import type { AppContext } from '../../context';
import type { RouteDef } from '../../lib/route';
import { createFitsService, type Actor } from './fits.service';

const err = (description: string) => ({ description, schema: errorBodySchema });
const uuid = (what: string) => z.string().uuid(`${what} must be a UUID`);
const recordParams = z.object({ recordId: uuid('Record id') });
const fitParams = z.object({ fitId: uuid('Fit id') });
const wellParams = z.object({ wellId: uuid('Well id') });
const actor = (req: Request): Actor => ({ user: req.user!, role: req.siteAccess?.role ?? null });

export function fitsRoutes(ctx: AppContext): RouteDef[] {
  const svc = createFitsService(ctx);
  return [
    {
      method: 'get', path: '/api/records/:recordId/reduced', tag: 'Fits', summary: "A record's reduced series for the workspace's in-browser preview (decimated beyond maxPoints)",
      params: recordParams, query: z.object({ maxPoints: z.coerce.number().int().min(100, 'maxPoints is at least 100').max(200_000, 'maxPoints is at most 200000').default(20_000) }),
      responses: { 200: { description: 'Reduced record', schema: reducedRecordSchema }, 404: err('No such record') },
      handler: (req) => svc.reducedFor(String(req.params.recordId), Number((req.query as unknown as { maxPoints: number }).maxPoints)),
    },
    {
      method: 'get', path: '/api/records/:recordId/fits', tag: 'Fits', summary: 'Every fit of a record, every revision',
      params: recordParams,
      responses: { 200: { description: 'Fits', schema: fitListSchema } },
      handler: async (req) => ({ fits: await svc.listForRecord(String(req.params.recordId), actor(req)) }),
    },
    {
      method: 'post', path: '/api/records/:recordId/fits', tag: 'Fits', summary: 'Fit a record (Analyst, Lead); computed and stored by the server as a Draft',
      params: recordParams, body: fitBodySchema, status: 201,
      responses: {
        201: { description: 'The new Draft fit with the server’s numbers', schema: fitSchema },
        400: err('Bad window or geometry, or an oscillating record without the override'),
      },
      handler: (req) => svc.create(String(req.params.recordId), actor(req), req.body),
    },
    {
      method: 'get', path: '/api/fits/:fitId', tag: 'Fits', summary: 'One fit, with what the caller may do with it',
      params: fitParams,
      responses: { 200: { description: 'The fit', schema: fitSchema }, 404: err('No such fit') },
      handler: (req) => svc.get(String(req.params.fitId), actor(req)),
    },
    {
      method: 'patch', path: '/api/fits/:fitId', tag: 'Fits', summary: 'Change a Draft or Sent-back fit; changing a Checked fit starts a new revision (201)',
      params: fitParams, body: fitPatchSchema,
      responses: {
        200: { description: 'The changed fit', schema: fitSchema },
        201: { description: 'A new revision of a Checked fit', schema: fitSchema },
        400: err('Bad input or a change the lifecycle does not allow'),
        403: err('Not the preparer'),
      },
      handler: async (req, res) => {
        const { fit, created } = await svc.update(String(req.params.fitId), actor(req), req.body);
        res.status(created ? 201 : 200).json(fit);
      },
    },
    {
      method: 'post', path: '/api/fits/:fitId/submit', tag: 'Fits', summary: 'Submit a Draft or Sent-back fit for checking; e-mails the site’s Checkers',
      params: fitParams, body: submitBodySchema,
      responses: {
        200: { description: 'Awaiting check', schema: fitSchema },
        400: err('Not a Draft or Sent-back fit, or a flag that changes K is neither resolved nor given a reason (FLAGS_UNANSWERED; each named under reasons.<code>)'),
        403: err('Not the preparer'),
      },
      handler: (req) => svc.submit(String(req.params.fitId), actor(req), req.body.reasons),
    },
    {
      method: 'post', path: '/api/fits/:fitId/check', tag: 'Fits', summary: 'Check a fit, or send it back with a comment (Checker, Lead; never the preparer); e-mails the preparer',
      params: fitParams, body: checkBodySchema,
      responses: { 200: { description: 'Checked or Sent back', schema: fitSchema }, 400: err('Not awaiting check, or no comment'), 403: err('The preparer cannot check their own fit') },
      handler: (req) => svc.check(String(req.params.fitId), actor(req), req.body.decision, req.body.comment),
    },
    {
      method: 'get', path: '/api/fits/:fitId/audit', tag: 'Fits', summary: 'The audit trail of a fit: every state and parameter change, who and when',
      params: fitParams,
      responses: { 200: { description: 'Events, oldest first', schema: fitAuditSchema } },
      handler: async (req) => ({ events: await svc.audit(String(req.params.fitId)) }),
    },
    {
      method: 'get', path: '/api/fits/:fitId/revisions', tag: 'Fits', summary: 'Every revision of a fit, oldest first',
      params: fitParams,
      responses: { 200: { description: 'Revisions', schema: fitListSchema } },
      handler: async (req) => ({ fits: await svc.revisions(String(req.params.fitId), actor(req)) }),
    },
    {
      method: 'get', path: '/api/wells/:wellId/fits', tag: 'Fits', summary: "Every fit of a well's records",
      params: wellParams,
      responses: { 200: { description: 'Fits', schema: fitListSchema } },
      handler: async (req) => ({ fits: await svc.listForWell(String(req.params.wellId), actor(req)) }),
    },
    {
      method: 'get', path: '/api/wells/:wellId/k', tag: 'Fits', summary: 'Well K: the geometric mean of the well’s Checked fits, with count and spread',
      params: wellParams,
      responses: { 200: { description: 'Well K (null K while no fit is Checked)', schema: wellKSchema } },
      handler: (req) => svc.wellKFor(String(req.params.wellId)),
    },
    {
      method: 'get', path: '/api/checks', tag: 'Fits', summary: 'The fits awaiting my check across my sites, oldest first',
      responses: { 200: { description: 'Check queue', schema: checkQueueSchema } },
      handler: async (req) => ({ items: await svc.queue(req.user!) }),
    },
  ];
}
