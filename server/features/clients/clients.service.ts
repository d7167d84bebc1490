import type { ClientListQuery, CreateClientInput, UpdateClientInput } from '../../../shared/schemas/clients';
import { iso, type Clock } from '../../lib/clock';
import { isUniqueViolation, type Db } from '../../lib/db';
import { errors } from '../../lib/errors';
import type { ClientsRepository } from './clients.repository';

const emailTaken = () => errors.field('email', 'Another client of this studio already has this e-mail address.');

export function clientsService(deps: { db: Db; repo: ClientsRepository; clock: Clock }) {
  const { repo, clock } = deps;
  const now = () => iso(clock.now());
  async function get(studioId: number, id: number) {
    const c = await repo.getView(studioId, id);
    if (!c) throw errors.notFound('That client');
    return c;
  }
  return {
    list: (studioId: number, q: ClientListQuery) => repo.list(studioId, q),
    get,
    async create(studioId: number, input: CreateClientInput) {
      if (input.email && (await repo.findByEmail(studioId, input.email))) throw emailTaken();
      try {
        return get(studioId, await repo.create(studioId, input, now()));
      } catch (err) {
        if (isUniqueViolation(err)) throw emailTaken();
        throw err;
      }
    },
    async update(studioId: number, id: number, input: UpdateClientInput) {
      const current = await repo.get(studioId, id);
      if (!current) throw errors.notFound('That client');
      // An erased client is a placeholder kept for its invoices; writing a name or address back would undo the erase.
      if (current.erased_at) throw errors.conflict('This client was erased; the placeholder kept for the invoices cannot be edited.', 'client_erased');
      if (current.user_id && 'email' in input && input.email !== current.email) {
        throw errors.field('email', 'This client has an account; they change their e-mail address themselves.');
      }
      if (input.email && input.email !== current.email && (await repo.findByEmail(studioId, input.email))) throw emailTaken();
      await repo.update(studioId, id, input, now());
      return get(studioId, id);
    },
  };
}

export type ClientsService = ReturnType<typeof clientsService>;
