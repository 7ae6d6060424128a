/** The demo team's accounts (one per role), seeded in demo mode and listed on the sign-in page. */
import type { Role } from '../../shared/api/common.ts';

/** Password of every demo account (issue 2; deliberately public, demo mode only). */
export const DEMO_PASSWORD = 'wyeward-demo';

export const DEMO_ACCOUNTS: { email: string; name: string; role: Role; password: string }[] = [
  { email: 'owner@wyeward.test', name: 'Maren Halloway', role: 'owner', password: DEMO_PASSWORD },
  { email: 'engineer@wyeward.test', name: 'Tobin Achterberg', role: 'engineer', password: DEMO_PASSWORD },
  { email: 'reviewer@wyeward.test', name: 'Idunn Castellane', role: 'reviewer', password: DEMO_PASSWORD },
  { email: 'viewer@wyeward.test', name: 'Rafe Okonkwo-Lindqvist', role: 'viewer', password: DEMO_PASSWORD },
];
