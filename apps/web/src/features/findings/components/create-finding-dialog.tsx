import { zodResolver } from '@hookform/resolvers/zod';
import {
  findingPriorityLabels,
  findingFormSchema,
  type FindingFormInput,
  type FindingFormOutput,
} from '@turnstone/contracts/findings';
import { useEffect, useRef } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '../../../components/ui/button.tsx';
import { Field, Input, Select } from '../../../components/ui/field.tsx';
import { fieldErrorsOf } from '../../../lib/api-client.ts';
import { useCreateFinding } from '../api/create-finding.ts';

/** Where a new finding comes from: a point, optionally its band or alert. */
export interface FindingOrigin {
  pointId: number;
  pointTag: string;
  alertId?: number | undefined;
  bandKey?: string | undefined;
  title: string;
  context: string;
}

const fields = ['title', 'workOrderRef', 'dueDate', 'note', 'priority', 'owner'] as const;

/**
 * A modal form (native `<dialog>`: focus is kept inside, Escape closes) that turns a review row
 * into a finding: title, work-order reference, due date, note.
 */
export function CreateFindingDialog({
  origin,
  onClose,
  onCreated,
}: {
  origin: FindingOrigin | null;
  onClose: () => void;
  onCreated?: (title: string) => void;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const form = useForm<FindingFormInput, unknown, FindingFormOutput>({
    resolver: zodResolver(findingFormSchema),
    defaultValues: {
      title: '',
      workOrderRef: '',
      dueDate: '',
      note: '',
      priority: 'medium',
      owner: '',
    },
  });
  const create = useCreateFinding();
  const { errors } = form.formState;

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (origin) {
      form.reset({
        title: origin.title,
        workOrderRef: '',
        dueDate: '',
        note: '',
        priority: 'medium',
        owner: '',
      });
      create.reset();
      if (!dialog.open) dialog.showModal();
    } else if (dialog.open) {
      dialog.close();
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [origin]);

  const onSubmit = form.handleSubmit((values) => {
    if (!origin) return;
    create
      .mutateAsync({
        pointId: origin.pointId,
        ...(origin.alertId !== undefined ? { alertId: origin.alertId } : {}),
        ...(origin.bandKey !== undefined ? { bandKey: origin.bandKey } : {}),
        ...values,
      })
      .then(
        (finding) => {
          onCreated?.(finding.title);
          onClose();
        },
        (error: unknown) => {
          const byField = fieldErrorsOf(error);
          for (const f of fields) if (byField[f]) form.setError(f, { message: byField[f] });
        },
      );
  });

  const serverError = create.error && Object.keys(fieldErrorsOf(create.error)).length === 0;

  return (
    <dialog
      ref={ref}
      aria-labelledby="create-finding-title"
      onClose={onClose}
      className="m-auto w-[min(34rem,calc(100vw-2rem))] rounded-lg border border-line bg-surface p-0 text-ink shadow-xl backdrop:bg-ink/30"
    >
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4 p-5">
        <div>
          <h2 id="create-finding-title" className="text-base font-semibold">
            Create finding
          </h2>
          {origin && <p className="mt-1 text-xs text-ink-muted">{origin.context}</p>}
        </div>
        {serverError && (
          <p role="alert" className="rounded-md bg-danger-soft px-3 py-2 text-sm">
            {create.error.message}
          </p>
        )}
        <Field label="Title" error={errors.title?.message}>
          {({ invalid, ...ids }) => (
            <Input {...ids} {...form.register('title')} invalid={invalid} autoFocus />
          )}
        </Field>
        <div className="grid gap-4 sm:grid-cols-2">
          <Field
            label="Work-order reference"
            hint="From the maintenance system; needed to mark it planned."
            error={errors.workOrderRef?.message}
          >
            {({ invalid, ...ids }) => (
              <Input
                {...ids}
                {...form.register('workOrderRef')}
                invalid={invalid}
                className="font-mono"
                spellCheck={false}
              />
            )}
          </Field>
          <Field label="Due date" error={errors.dueDate?.message}>
            {({ invalid, ...ids }) => (
              <Input
                {...ids}
                {...form.register('dueDate')}
                invalid={invalid}
                type="date"
                className="font-mono"
              />
            )}
          </Field>
        </div>
        <div className="grid gap-4 sm:grid-cols-2">
          <Field label="Priority" error={errors.priority?.message}>
            {({ invalid: _invalid, ...ids }) => (
              <Select {...ids} {...form.register('priority')}>
                {(['high', 'medium', 'low'] as const).map((p) => (
                  <option key={p} value={p}>
                    {findingPriorityLabels[p]}
                  </option>
                ))}
              </Select>
            )}
          </Field>
          <Field label="Owner" hint="Person or crew doing the work." error={errors.owner?.message}>
            {({ invalid, ...ids }) => (
              <Input {...ids} {...form.register('owner')} invalid={invalid} />
            )}
          </Field>
        </div>
        <Field label="Note" error={errors.note?.message}>
          {({ invalid, ...ids }) => (
            <textarea
              {...ids}
              {...form.register('note')}
              aria-invalid={invalid || undefined}
              rows={3}
              className="block w-full rounded-md border border-line-strong bg-surface px-3 py-2 text-sm text-ink focus-visible:border-accent"
            />
          )}
        </Field>
        <div className="flex justify-end gap-2 border-t border-line pt-4">
          <Button variant="ghost" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" busy={create.isPending}>
            Save finding
          </Button>
        </div>
      </form>
    </dialog>
  );
}
