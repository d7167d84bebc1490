import type { AppMeta } from '../../../shared/schemas/auth';
import { publicRoute } from '../../lib/policy';
import { json, type RouteTable } from '../../lib/routes';

export function metaRoutes(r: RouteTable, deps: { meta: AppMeta }) {
  r.get('/health', publicRoute(), json(() => ({ ok: true })));
  r.get('/meta', publicRoute(), json(() => deps.meta));
}
