import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { ImportStudyButton } from '../../../../src/features/review/components/import-study.tsx';
import { apiError, stubApi } from '../../helpers/fake-api.ts';
import { renderReview } from './render-review.tsx';

describe('import a study file', () => {
  it('lists the problems of a refused file as the server words them, without the paths in the file', async () => {
    const posted: unknown[] = [];
    stubApi({
      'POST /api/studies/import': (req) => {
        posted.push(req.body);
        return apiError(400, 'validation', 'The file has problems', { fields: { 'circuit.elements[2].each.kw': 'element LOAD3: every phase › P (kW) must be a number', name: 'Name is required' } });
      },
    });
    const user = userEvent.setup();
    renderReview(<ImportStudyButton />, '/');
    await user.click(screen.getByRole('button', { name: 'Import study' }));
    const dialog = await screen.findByRole('dialog', { name: 'Import a study' });
    const file = new File([JSON.stringify({ format: 'wyeward-study', version: 1, name: '' })], 'x.wyeward.json', { type: 'application/json' });
    await user.upload(within(dialog).getByLabelText('Study file'), file);
    await user.click(within(dialog).getByRole('button', { name: 'Import' }));
    const problems = await within(dialog).findByRole('list', { name: 'Problems in the file' });
    expect(within(problems).getAllByRole('listitem').map((li) => li.textContent)).toEqual(['element LOAD3: every phase › P (kW) must be a number', 'Name is required']);
    expect(problems).not.toHaveTextContent('circuit.elements');
    expect(posted).toEqual([{ format: 'wyeward-study', version: 1, name: '' }]);
  });

  it('says a non-JSON file is not a study file without sending it', async () => {
    const api = stubApi({});
    const user = userEvent.setup();
    renderReview(<ImportStudyButton />, '/');
    await user.click(screen.getByRole('button', { name: 'Import study' }));
    const dialog = await screen.findByRole('dialog', { name: 'Import a study' });
    await user.upload(within(dialog).getByLabelText('Study file'), new File(['not json'], 'notes.json', { type: 'application/json' }));
    await user.click(within(dialog).getByRole('button', { name: 'Import' }));
    await waitFor(() => expect(within(dialog).getByRole('alert')).toHaveTextContent('notes.json is not a JSON file.'));
    expect(api.calls).toHaveLength(0);
  });
});
