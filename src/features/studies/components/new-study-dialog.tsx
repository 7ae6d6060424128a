import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { createStudyRequestSchema, type CreatedStudy } from '../../../../shared/api/studies.ts';
import { Button } from '../../../components/button.tsx';
import { Dialog } from '../../../components/dialog.tsx';
import { TextAreaField, TextField } from '../../../components/field.tsx';
import { Notice } from '../../../components/notice.tsx';
import { applyServerErrors } from '../../../lib/form-errors.ts';
import { useCreateStudy } from '../api/create-study.ts';

type NewStudyInput = z.input<typeof createStudyRequestSchema>;
type NewStudyOutput = z.output<typeof createStudyRequestSchema>;

/** Name and description of a new, empty study (60 Hz); opens it once created. */
export function NewStudyDialog({ open, onClose, onCreated }: { open: boolean; onClose: () => void; onCreated: (created: CreatedStudy) => void }) {
  const create = useCreateStudy();
  const [problem, setProblem] = useState<string | null>(null);
  const form = useForm<NewStudyInput, unknown, NewStudyOutput>({
    resolver: zodResolver(createStudyRequestSchema),
    defaultValues: { name: '', description: '' },
  });
  const { errors } = form.formState;

  function close() {
    form.reset();
    setProblem(null);
    onClose();
  }

  const onSubmit = form.handleSubmit((values) => {
    setProblem(null);
    create.mutate(values, {
      onSuccess: (created) => {
        form.reset();
        onCreated(created);
      },
      onError: (error) => setProblem(applyServerErrors(error, form.setError, ['name', 'description'])),
    });
  });

  return (
    <Dialog open={open} onClose={close} title="New study" description="Starts with an empty circuit at 60 Hz; you can change it later.">
      <form noValidate onSubmit={onSubmit} className="flex flex-col gap-3">
        {problem ? <Notice tone="error" title={problem} /> : null}
        <TextField label="Name" data-autofocus error={errors.name?.message} {...form.register('name')} />
        <TextAreaField label="Description" hint="Optional: what the study is for, which feeder, which question." error={errors.description?.message} {...form.register('description')} />
        <div className="mt-1 flex justify-end gap-2">
          <Button onClick={close}>Cancel</Button>
          <Button type="submit" variant="primary" busy={create.isPending} busyText="Creating…">
            Create study
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
