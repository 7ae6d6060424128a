/**
 * What each role may do in the UI. The server enforces the same rules on every route; the UI
 * only hides what a role cannot do, so people are not offered buttons that would be refused.
 */
import { roleAtLeast, type Role } from '../../shared/api/common.ts';

export type Permission =
  | 'study:create'
  | 'study:edit'
  | 'study:delete'
  | 'study:clone'
  | 'team:manage'
  | 'mail:read';

const MIN_ROLE: Record<Permission, Role> = {
  'study:create': 'engineer',
  'study:edit': 'engineer',
  'study:delete': 'engineer',
  'study:clone': 'engineer',
  'team:manage': 'owner',
  'mail:read': 'owner',
};

/** True when `role` may do `permission` (api contract, "Roles"). */
export function can(role: Role | undefined, permission: Permission): boolean {
  return role !== undefined && roleAtLeast(role, MIN_ROLE[permission]);
}

/** Words for a role, as shown in badges and selects. */
export const ROLE_LABEL: Record<Role, string> = {
  owner: 'Owner',
  engineer: 'Engineer',
  reviewer: 'Reviewer',
  viewer: 'Viewer',
};

/** What each role may do, in one line (shown next to the role select and on invites). */
export const ROLE_HINT: Record<Role, string> = {
  owner: 'everything, including members, roles, invites, outgoing mail and the audit trail',
  engineer: 'creates, edits, clones and deletes studies; requests reviews; marks approved studies as templates',
  reviewer: 'reads studies, comments, and approves them or requests changes',
  viewer: 'reads studies and their comments',
};
