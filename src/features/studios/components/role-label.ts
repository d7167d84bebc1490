import type { Role } from '../../../../shared/schemas/common';

export const ROLE_LABEL: Record<Role, string> = { owner: 'Owner', painter: 'Painter', client: 'Client' };
