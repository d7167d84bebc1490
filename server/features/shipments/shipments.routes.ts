import type { Request } from 'express';
import { z } from 'zod';
import { id } from '../../../shared/schemas/common';
import { deliveredInput, shipInput, shippingSettingsInput, updateShipmentInput } from '../../../shared/schemas/shipments';
import { member, user, type Allow } from '../../lib/policy';
import { json, params, type RouteTable } from '../../lib/routes';
import { validate } from '../../lib/validate';
import type { ShipmentsService } from './shipments.service';

const commissionParams = z.object({ studioId: id, commissionId: id });
const shipmentParams = commissionParams.extend({ shipmentId: id });
type ShipmentParams = z.infer<typeof shipmentParams>;
const actor = (req: Request) => ({ ...member(req), userId: user(req).id });

export function shipmentsRoutes(r: RouteTable, deps: { allow: Allow; shipments: ShipmentsService }) {
  const { allow, shipments } = deps;
  const base = '/studios/:studioId/commissions/:commissionId/shipments';
  r.get('/studios/:studioId/shipping-settings', allow('owner', 'painter'), json((req) => shipments.getSettings(member(req).studioId)));
  r.put('/studios/:studioId/shipping-settings', allow('owner'), validate({ body: shippingSettingsInput }), json((req) => shipments.saveSettings(member(req).studioId, req.body)));
  r.get(base, allow('owner', 'painter', 'client'), validate({ params: commissionParams }), json((req, res) => shipments.list(actor(req), params(res).commissionId)));
  r.post(base, allow('owner'), validate({ params: commissionParams }), json((req, res) => shipments.create(actor(req), params(res).commissionId), 201));
  r.patch(`${base}/:shipmentId`, allow('owner', 'painter'), validate({ params: shipmentParams, body: updateShipmentInput }), json((req, res) => shipments.update(actor(req), params<ShipmentParams>(res).commissionId, params<ShipmentParams>(res).shipmentId, req.body)));
  r.post(`${base}/:shipmentId/ship`, allow('owner'), validate({ params: shipmentParams, body: shipInput }), json((req, res) => shipments.ship(actor(req), params<ShipmentParams>(res).commissionId, params<ShipmentParams>(res).shipmentId, req.body)));
  r.post(`${base}/:shipmentId/delivered`, allow('owner'), validate({ params: shipmentParams, body: deliveredInput }), json((req, res) => shipments.delivered(actor(req), params<ShipmentParams>(res).commissionId, params<ShipmentParams>(res).shipmentId, req.body)));
  r.post(`${base}/:shipmentId/received`, allow('client'), validate({ params: shipmentParams }), json((req, res) => shipments.received(actor(req), params<ShipmentParams>(res).commissionId, params<ShipmentParams>(res).shipmentId)));
}
