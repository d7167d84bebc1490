import { createContext, useContext, type ReactNode } from 'react';
import type { Role } from '../../shared/schemas/common';

/**
 * What every screen inside /studio/:studioId needs to know: which studio, the caller's role in it,
 * and how the studio shows dates and money. The studio layout (app/) provides it, features read it.
 */
export type StudioScope = {
  studioId: number;
  /** The signed-in person, so a screen can tell "you" apart from others. */
  userId: number;
  role: Role;
  studioName: string;
  timezone: string;
  currency: string;
};

const StudioScopeContext = createContext<StudioScope | null>(null);

export function StudioScopeProvider({ value, children }: { value: StudioScope; children: ReactNode }) {
  return <StudioScopeContext.Provider value={value}>{children}</StudioScopeContext.Provider>;
}

export function useStudioScope(): StudioScope {
  const scope = useContext(StudioScopeContext);
  if (!scope) throw new Error('useStudioScope is used outside a studio layout.');
  return scope;
}
