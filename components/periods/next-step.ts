import { can, ROLE_LABELS, ROLES, type Permission, type Role } from '@/lib/auth/policy';
import type { PeriodState } from '@/lib/periods/calendar';

const NEXT: Record<PeriodState, { permission: Permission; doing: string } | null> = {
  open: { permission: 'periods:review', doing: 'moves it to review' },
  review: { permission: 'periods:sign', doing: 'signs it' },
  signed: null,
};

/**
 * For a member who cannot take a period's next step, who can ("An owner or a sustainability analyst
 * moves it to review."), read from the policy table; null when the member can, or when there is none.
 */
export function periodNextStepNote(state: PeriodState, role: Role): string | null {
  const next = NEXT[state];
  if (!next || can(role, next.permission)) return null;
  const who = ROLES.filter((r) => can(r, next.permission)).map((r) => {
    const label = ROLE_LABELS[r].toLowerCase();
    return `${/^[aeiou]/.test(label) ? 'an' : 'a'} ${label}`;
  });
  if (!who.length) return null;
  const list = who.length === 1 ? who[0] : `${who.slice(0, -1).join(', ')} or ${who[who.length - 1]}`;
  return `${list[0].toUpperCase()}${list.slice(1)} ${next.doing}.`;
}
