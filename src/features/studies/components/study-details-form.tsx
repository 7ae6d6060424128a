import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { studyDescriptionSchema, studyNameSchema, type StudyDetail } from '../../../../shared/api/studies.ts';
import { Button } from '../../../components/button.tsx';
import { TextAreaField, TextField } from '../../../components/field.tsx';
import { Notice } from '../../../components/notice.tsx';
import { applyServerErrors } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { conflictOf } from '../../../lib/api/studies.ts';
import { useUpdateStudy } from '../api/update-study.ts';

/** The editable part of a study's details, built from the API's own field schemas. */
const detailsSchema = z.object({ name: studyNameSchema, description: studyDescriptionSchema, isTemplate: z.boolean() });
type DetailsInput = z.input<typeof detailsSchema>;
type DetailsOutput = z.output<typeof detailsSchema>;

function valuesOf(study: StudyDetail): DetailsInput {
  return { name: study.name, description: study.description, isTemplate: study.isTemplate };
}

/**
 * Edits name, description and template flag against the version the user started from. When
 * someone else saved in between (409), it shows their version and lets the user choose: take
 * theirs, or keep editing and knowingly replace it on the next save. Never a silent overwrite.
 */
const STATUS_WORDS: Record<StudyDetail['status'], string> = { draft: 'a draft', 'in-review': 'in review', 'changes-requested': 'waiting for changes', approved: 'approved' };

export function StudyDetailsForm({ study, onDone }: { study: StudyDetail; onDone: () => void }) {
  const templateAllowed = study.status === 'approved' || study.isTemplate;
  const update = useUpdateStudy(study.id);
  const [baseVersion, setBaseVersion] = useState(study.version);
  const [conflict, setConflict] = useState<StudyDetail | null>(null);
  const [overwriteOf, setOverwriteOf] = useState<StudyDetail | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const form = useForm<DetailsInput, unknown, DetailsOutput>({ resolver: zodResolver(detailsSchema), defaultValues: valuesOf(study) });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setProblem(null);
    update.mutate(
      { version: baseVersion, ...values },
      {
        onSuccess: () => onDone(),
        onError: (error) => {
          const current = conflictOf(error);
          if (current) {
            setConflict(current);
            setOverwriteOf(null);
            return;
          }
          setProblem(applyServerErrors(error, form.setError, ['name', 'description', 'isTemplate']));
        },
      },
    );
  });

  function takeTheirs(current: StudyDetail) {
    form.reset(valuesOf(current));
    setBaseVersion(current.version);
    setConflict(null);
    setOverwriteOf(null);
  }

  function keepMine(current: StudyDetail) {
    setBaseVersion(current.version);
    setConflict(null);
    setOverwriteOf(current);
  }

  return (
    <form noValidate onSubmit={onSubmit} aria-label="Edit study details" className="flex flex-col gap-3">
      {conflict ? (
        <div role="alert" className="rounded-[3px] border border-caution/60 bg-caution-soft px-3 py-2 text-sm">
          <p className="font-semibold">
            <span aria-hidden="true">! </span>
            {conflict.updatedBy.name} saved this study while you were editing (<span className="num">{formatDateTime(conflict.updatedAt)}</span>).
          </p>
          <p className="mt-1 text-[13px]">Nothing of yours was saved. Their version reads:</p>
          <dl className="mt-1 grid grid-cols-[max-content_1fr] gap-x-3 gap-y-0.5 text-[13px]">
            <dt className="text-ink-muted">Name</dt>
            <dd>{conflict.name}</dd>
            <dt className="text-ink-muted">Description</dt>
            <dd className="whitespace-pre-wrap">{conflict.description || '—'}</dd>
            <dt className="text-ink-muted">Template</dt>
            <dd>{conflict.isTemplate ? 'yes' : 'no'}</dd>
          </dl>
          <div className="mt-2 flex flex-wrap gap-2">
            <Button size="sm" variant="primary" onClick={() => takeTheirs(conflict)}>
              Reload theirs (discard my changes)
            </Button>
            <Button size="sm" onClick={() => keepMine(conflict)}>
              Keep editing mine
            </Button>
          </div>
        </div>
      ) : null}
      {overwriteOf ? (
        <Notice tone="caution" title={`Saving now replaces what ${overwriteOf.updatedBy.name} saved at ${formatDateTime(overwriteOf.updatedAt)}.`} />
      ) : null}
      {problem ? <Notice tone="error" title={problem} /> : null}
      <TextField label="Name" error={errors.name?.message} {...form.register('name')} />
      <TextAreaField label="Description" error={errors.description?.message} {...form.register('description')} />
      {/* Only an approved study may become a template (the server refuses it otherwise): offer the box only then, and say why not. */}
      {templateAllowed ? (
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" className="h-4 w-4 accent-accent" {...form.register('isTemplate')} />
          Template — others on the team can start new studies from it
        </label>
      ) : (
        <p className="text-[13px] text-ink-muted">
          Template: only an approved study can become a template; this one is {STATUS_WORDS[study.status]}. Request a review, and mark it once it is approved.
        </p>
      )}
      <div className="flex gap-2">
        <Button type="submit" variant="primary" busy={update.isPending} busyText="Saving…" disabled={conflict !== null}>
          Save changes
        </Button>
        <Button onClick={onDone}>Cancel</Button>

      </div>
    </form>
  );
}
