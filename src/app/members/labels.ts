import type { MemberStatus } from '../../../shared/schemas/members';

/** Words an admin reads for each member status. */
export const STATUS_LABELS: Readonly<Record<MemberStatus, string>> = {
  active: 'Active',
  invited: 'Invited',
  deactivated: 'Deactivated',
};
