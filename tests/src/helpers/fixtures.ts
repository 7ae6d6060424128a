/** Contract-shaped records for component tests (invented people and feeders). */
import type { Me } from '../../../shared/api/auth.ts';
import type { Role } from '../../../shared/api/common.ts';
import type { StudyDetail, StudySummary } from '../../../shared/api/studies.ts';

export function me(role: Role): Me {
  return {
    user: { id: '00000000-0000-4000-8000-0000000000a1', name: 'Ines Marlowe', email: `${role}@wyeward.test` },
    team: { id: '00000000-0000-4000-8000-0000000000t1', name: 'Harrowgate Works' },
    role,
  };
}

let n = 0;
export function study(overrides: Partial<StudySummary> = {}): StudySummary {
  n += 1;
  const id = `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`;
  return {
    id,
    name: `Study ${n}`,
    description: '',
    status: 'draft',
    isTemplate: false,
    version: 1,
    createdBy: { id: 'u1', name: 'Ines Marlowe' },
    updatedBy: { id: 'u1', name: 'Ines Marlowe' },
    createdAt: '2026-11-02T09:00:00.000Z',
    updatedAt: '2026-11-02T09:00:00.000Z',
    elementCount: 0,
    ...overrides,
  };
}

export function studyDetail(overrides: Partial<StudyDetail> = {}): StudyDetail {
  return {
    ...study(),
    content: { circuit: { format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: [] } },
    clonedFrom: null,
    ...overrides,
  };
}
