import { z } from 'zod';
import { id } from '../../../shared/schemas/common';
import { eraseClientInput } from '../../../shared/schemas/privacy';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { PrivacyService } from './privacy.service';

const clientParams = z.object({ studioId: id, clientId: id });

/** A client's data: what stops an erase, the export (ZIP) and the erase itself. Owners only. */
export function privacyRoutes(r: RouteTable, deps: { allow: Allow; privacy: PrivacyService }) {
  const { allow, privacy } = deps;
  r.get('/studios/:studioId/clients/:clientId/privacy', allow('owner'), validate({ params: clientParams }), json((req, res) => privacy.summary(member(req).studioId, params(res).clientId)));
  r.get('/studios/:studioId/clients/:clientId/export', allow('owner'), validate({ params: clientParams }), async (req, res) => {
    const archive = await privacy.exportArchive(member(req).studioId, params(res).clientId);
    res.set({ 'Content-Type': 'application/zip', 'Content-Disposition': `attachment; filename="${archive.filename}"`, 'Cache-Control': 'no-store' });
    await archive.pipeTo(res).catch((err) => req.log.error({ err }, 'client export stopped'));
  });
  r.post('/studios/:studioId/clients/:clientId/erase', allow('owner'), validate({ params: clientParams, body: eraseClientInput }), json((req, res) => privacy.erase({ studioId: member(req).studioId, userId: user(req).id }, params(res).clientId, req.body)));
}
