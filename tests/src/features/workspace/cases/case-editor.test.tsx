/** The case editor: create (name checked), rename, delete, an override picked from an element as drawn; read-only roles only switch. */
import { fireEvent, render, screen, within } from '@testing-library/react';
import { useState } from 'react';
import { describe, expect, it } from 'vitest';
import { BASE_CASE_ID, demoCircuits, type StudyCase } from '../../../../../shared/engine/index.ts';
import { CaseEditor } from '../../../../../src/features/workspace/cases/case-editor.tsx';

const circuit = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;

function Harness({ initial = [] as StudyCase[], readOnly = false, seen }: { initial?: StudyCase[]; readOnly?: boolean; seen: StudyCase[][] }) {
  const [cases, setCases] = useState(initial);
  const [active, setActive] = useState(BASE_CASE_ID);
  return (
    <CaseEditor
      cases={cases}
      circuit={circuit}
      active={active}
      onActivate={setActive}
      onChange={
        readOnly
          ? null
          : (next) => {
              seen.push(next);
              setCases(next);
            }
      }
    />
  );
}

describe('<CaseEditor>', () => {
  it('creates a case (refusing a duplicate name), sets an override, renames and deletes it', () => {
    const seen: StudyCase[][] = [];
    render(<Harness seen={seen} initial={[{ id: 'peak', name: 'Peak', changes: [] }]} />);
    fireEvent.click(screen.getByRole('button', { name: 'New case' }));
    fireEvent.change(screen.getByLabelText('Case name'), { target: { value: 'peak' } });
    expect(screen.getByText('A case named "peak" already exists.')).toBeTruthy();
    expect((screen.getByRole('button', { name: 'Create case' }) as HTMLButtonElement).disabled).toBe(true);
    fireEvent.change(screen.getByLabelText('Case name'), { target: { value: 'Heavy kitchen' } });
    fireEvent.click(screen.getByRole('button', { name: 'Create case' }));
    expect((screen.getByLabelText('Case shown') as HTMLSelectElement).selectedOptions[0].textContent).toBe('Heavy kitchen');

    fireEvent.change(screen.getByLabelText('Element to change'), { target: { value: 'KITCHEN' } });
    fireEvent.change(screen.getByLabelText('Value to change'), { target: { value: 'each.kw' } });
    fireEvent.change(screen.getByLabelText('New value'), { target: { value: 'abc' } });
    expect(screen.getByText('Enter a number.')).toBeTruthy();
    fireEvent.change(screen.getByLabelText('New value'), { target: { value: '3.5' } });
    fireEvent.click(screen.getByRole('button', { name: 'Set in case' }));
    const changes = screen.getByRole('list', { name: 'Changes of this case' });
    expect(within(changes).getByText('KITCHEN: every phase › P (kW) 1.5 → 3.5')).toBeTruthy();
    expect(seen[seen.length - 1][1].changes).toEqual([{ element: 'KITCHEN', set: { each: { kw: 3.5, kvar: 0.2 } } }]);

    fireEvent.click(screen.getByRole('button', { name: 'Rename case' }));
    fireEvent.change(screen.getByLabelText('Case name'), { target: { value: 'Kitchen at peak' } });
    fireEvent.click(screen.getByRole('button', { name: 'Rename' }));
    expect(seen[seen.length - 1].map((c) => c.name)).toEqual(['Peak', 'Kitchen at peak']);

    fireEvent.click(screen.getByRole('button', { name: 'Delete case' }));
    expect(seen[seen.length - 1].map((c) => c.name)).toEqual(['Peak']);
    expect((screen.getByLabelText('Case shown') as HTMLSelectElement).value).toBe(BASE_CASE_ID);
  });

  it('read-only: the cases can be shown, not edited', () => {
    render(<Harness seen={[]} readOnly initial={[{ id: 'lost', name: 'Neutral lost', changes: [{ element: 'DROP', set: { open: [] } }] }]} />);
    expect(screen.queryByRole('button', { name: 'New case' })).toBeNull();
    fireEvent.change(screen.getByLabelText('Case shown'), { target: { value: 'lost' } });
    expect(screen.getByRole('list', { name: 'Changes of this case' }).textContent).toBe('DROP: open conductors neutral → none');
    expect(screen.queryByRole('form', { name: 'Add a change' })).toBeNull();
  });
});
