/**
 * The page of an old revision offers the report of that revision (PDF and print view), not only
 * the latest one the study page links: a reviewer reading revision 1 after revision 3 can print it.
 */
import { screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { RevisionPage } from '../../../../src/features/review/components/revision-page.tsx';
import { demoCircuits } from '../../../../shared/engine/index.ts';
import { summarizeCircuit } from '../../../../shared/review/index.ts';
import { stubApi } from '../../helpers/fake-api.ts';
import { studyDetail } from '../../helpers/fixtures.ts';
import { renderReview } from './render-review.tsx';
import { revision, STUDY_ID } from './review-fixtures.ts';

const circuit = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;

describe('revision page', () => {
  it('links the PDF report and the print view of the revision shown', async () => {
    stubApi({
      'GET /api/studies/:id/revisions/:n': () => ({ body: { ...revision(1), content: { circuit }, summary: summarizeCircuit(circuit) } }),
      'GET /api/studies/:id/revisions': () => ({ body: { items: [revision(3), revision(2), revision(1)] } }),
      'GET /api/studies/:id': () => ({ body: studyDetail({ id: STUDY_ID, name: 'Lane 14', content: { circuit } }) }),
    });
    renderReview(<RevisionPage studyId={STUDY_ID} n={1} role="reviewer" />);
    const pdf = await screen.findByRole('link', { name: 'Report of revision 1 (PDF)' });
    expect(pdf).toHaveAttribute('href', `/api/studies/${STUDY_ID}/report.pdf?revision=1`);
    expect(screen.getByRole('link', { name: 'Print view' })).toHaveAttribute('href', `/studies/${STUDY_ID}/print/1`);
    expect(document.title).toBe('Revision 1 — Lane 14 — Wyeward');
  });
});
