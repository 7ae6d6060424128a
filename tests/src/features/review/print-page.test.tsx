/**
 * The print view of a study case: the page shows the case, and its "Download the PDF" link asks
 * for the report of that same case (and units), not of the base circuit.
 */
import { screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { PrintPage } from '../../../../src/features/review/components/print-page.tsx';
import { demoCircuits } from '../../../../shared/engine/index.ts';
import { stubApi } from '../../helpers/fake-api.ts';
import { studyDetail } from '../../helpers/fixtures.ts';
import { renderReview } from './render-review.tsx';
import { revision, reviewState, STUDY_ID } from './review-fixtures.ts';

const base = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const circuit = { ...base, cases: [{ id: 'case-2', name: 'Rod removed', changes: [{ element: 'ROD', set: { ohms: 1e6 } }] }] };

function setup() {
  stubApi({
    'GET /api/studies/:id/revisions/:n': () => ({ body: { ...revision(1), content: { circuit }, summary: { ok: true } } }),
    'GET /api/studies/:id/review': () => ({ body: reviewState() }),
    'GET /api/studies/:id': () => ({ body: studyDetail({ id: STUDY_ID, name: 'Lane 14', content: { circuit } }) }),
  });
}

describe('print view of a study case', () => {
  it('links the PDF of the case shown, in the units shown', async () => {
    setup();
    renderReview(<PrintPage studyId={STUDY_ID} n={1} units="pu" caseId="case-2" />);
    expect(await screen.findByText('Rod removed', { selector: 'dd' })).toBeInTheDocument();
    const link = screen.getByRole('link', { name: 'Download the PDF' });
    const url = new URL(link.getAttribute('href')!, 'http://wyeward.test');
    expect(url.pathname).toBe(`/api/studies/${STUDY_ID}/report.pdf`);
    expect(Object.fromEntries(url.searchParams)).toEqual({ revision: '1', case: 'case-2', units: 'pu' });
    // the browser's "Save as PDF" takes its file name and page header from the title
    expect(document.title).toBe('Lane 14 — Revision 1, case Rod removed — Wyeward');
  });

  it('links the base circuit\'s PDF when no case is shown', async () => {
    setup();
    renderReview(<PrintPage studyId={STUDY_ID} n={1} />);
    const link = await screen.findByRole('link', { name: 'Download the PDF' });
    expect(Object.fromEntries(new URL(link.getAttribute('href')!, 'http://wyeward.test').searchParams)).toEqual({ revision: '1' });
  });
});

describe('print view of a case the revision does not have', () => {
  it('says so and links the base circuit, instead of failing the page', async () => {
    setup();
    renderReview(<PrintPage studyId={STUDY_ID} n={1} units="pu" caseId="nope" />);
    expect(await screen.findByText('Revision 1 has no study case “nope”.')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Print view of the base circuit' })).toHaveAttribute('href', `/studies/${STUDY_ID}/print/1?units=pu`);
  });
});

describe('print view of an empty study', () => {
  it('says that nothing is drawn where the diagram and the inputs would be', async () => {
    const empty = { format: 'wyeward-circuit' as const, version: 1 as const, frequencyHz: 50, elements: [] };
    stubApi({
      'GET /api/studies/:id/revisions/:n': () => ({ body: { ...revision(1), content: { circuit: empty }, summary: { ok: true } } }),
      'GET /api/studies/:id/review': () => ({ body: reviewState() }),
      'GET /api/studies/:id': () => ({ body: studyDetail({ id: STUDY_ID, name: 'Blank', content: { circuit: empty } }) }),
    });
    renderReview(<PrintPage studyId={STUDY_ID} n={1} />);
    expect(await screen.findAllByText('Nothing is drawn in this revision yet.')).toHaveLength(2);
    expect(screen.queryByRole('img', { name: 'One-line diagram' })).not.toBeInTheDocument();
  });
});
