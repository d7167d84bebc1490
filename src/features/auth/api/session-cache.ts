import type { QueryClient } from '@tanstack/react-query';
import type { MeResponse } from '../../../../shared/schemas/auth';
import { meQueryOptions } from './get-me';

let signedOutOnPurpose = false;

/**
 * True after the person pressed "Sign out" (until someone signs in again), so the sign-in screen
 * does not offer to bring them back to where they were.
 */
export function signedOutByChoice(): boolean {
  return signedOutOnPurpose;
}

/**
 * A new person is signed in (or nobody is): keep the app's meta, set who is signed in, and drop
 * everything cached for the previous person.
 */
export function replaceSession(queryClient: QueryClient, me: MeResponse | null, opts: { byChoice?: boolean } = {}): void {
  signedOutOnPurpose = me === null && opts.byChoice === true;
  queryClient.setQueryData(meQueryOptions().queryKey, me);
  queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== 'auth' });
}
