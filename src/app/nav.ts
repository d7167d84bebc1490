import { Brush, ClipboardList, House, Palette, Settings, UserRoundCog, Users, type LucideIcon } from 'lucide-react';
import { Inbox } from 'lucide-react';
import { Receipt } from 'lucide-react';
import { CalendarDays } from 'lucide-react';
import type { Role } from '../../shared/schemas/common';

export type NavItem = {
  /** Relative to /studio/:studioId; '' is the studio's home. */
  to: string;
  label: string;
  icon: LucideIcon;
  roles: readonly Role[];
  /** Other screens (relative to the studio) that belong to this entry and light it up too. */
  also?: readonly string[];
};

/**
 * The studio's rail, top to bottom. Later screens slot in here (Bench, Commissions,
 * Quotes & invoices, Paints & recipes, Calendar) with the roles that may open them.
 */
export const STUDIO_NAV: readonly NavItem[] = [
  { to: '', label: 'Home', icon: House, roles: ['owner', 'painter'] },
  { to: 'bench', label: 'Bench', icon: Brush, roles: ['owner', 'painter'] },
  { to: 'commissions', label: 'Commissions', icon: ClipboardList, roles: ['owner', 'painter'] },
  { to: 'clients', label: 'Clients', icon: Users, roles: ['owner', 'painter'] },
  { to: 'money', label: 'Quotes & invoices', icon: Receipt, roles: ['owner'], also: ['quotes', 'invoices', 'reports'] },
  { to: 'paints', label: 'Paints & recipes', icon: Palette, roles: ['owner', 'painter'] },
  { to: 'calendar', label: 'Calendar', icon: CalendarDays, roles: ['owner', 'painter'] },
  { to: 'enquiries', label: 'Enquiries', icon: Inbox, roles: ['owner'] },
  { to: 'team', label: 'Team', icon: UserRoundCog, roles: ['owner'] },
  { to: 'settings', label: 'Settings', icon: Settings, roles: ['owner'] },
];

export function navFor(role: Role): NavItem[] {
  return STUDIO_NAV.filter((item) => item.roles.includes(role));
}

/** Whether a rail entry is the current one for a path below /studio/:studioId (e.g. 'invoices/12'). */
export function navItemIsCurrent(item: NavItem, rest: string): boolean {
  const under = (to: string) => rest === to || rest.startsWith(`${to}/`);
  if (item.to === '') return rest === '';
  if (under(item.to)) return true;
  // A commission's quotes and cancel screens sit under commissions/ and stay with Commissions.
  return (item.also ?? []).some(under);
}
