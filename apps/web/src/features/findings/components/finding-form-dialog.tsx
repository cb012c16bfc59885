import { zodResolver } from '@hookform/resolvers/zod';
import {
  findingFormSchema,
  findingPriorityLabels,
  type FindingFormInput,
  type FindingFormOutput,
} from '@turnstone/contracts/findings';
import { useEffect, useRef } from 'react';
import { useForm } from 'react-hook-form';
import { Button } from '../../../components/ui/button.tsx';
import { Field, InputField, type SelectOption } from '../../../components/ui/field.tsx';
import { FormFields, type FieldSpec } from '../../../components/ui/form-fields.tsx';
import { formField } from '../../../lib/form-field.ts';
import { fieldErrorsOf } from '../../../lib/api-client.ts';

const fields = [
  'title',
  'workOrderRef',
  'dueDate',
  'note',
  'priority',
  'owner',
  'plannedDowntimeHours',
] as const;

const referenceFields: FieldSpec<FindingFormInput>[] = [
  {
    kind: 'text',
    name: 'workOrderRef',
    label: 'Work-order reference',
    hint: 'From the maintenance system; needed to mark it planned.',
    inputClassName: 'font-mono',
    spellCheck: false,
  },
  { kind: 'text', name: 'dueDate', label: 'Due date', type: 'date', inputClassName: 'font-mono' },
];

const workFields: FieldSpec<FindingFormInput>[] = [
  {
    kind: 'select',
    name: 'priority',
    label: 'Priority',
    options: (['high', 'medium', 'low'] as const).map((p): SelectOption => [
      p,
      findingPriorityLabels[p],
    ]),
  },
  { kind: 'text', name: 'owner', label: 'Owner', hint: 'Person or crew doing the work.' },
  {
    kind: 'text',
    name: 'plannedDowntimeHours',
    label: 'Planned downtime (h)',
    hint: 'Machine stopped for the work, hours.',
    inputMode: 'decimal',
    inputClassName: 'font-mono',
  },
];

export const emptyFindingForm: FindingFormInput = {
  title: '',
  workOrderRef: '',
  dueDate: '',
  note: '',
  priority: 'medium',
  owner: '',
  plannedDowntimeHours: '',
};

/**
 * The finding form in a modal (native `<dialog>`: focus is kept inside, Escape closes), for
 * creating a finding and for editing one: title, work-order reference, due date, priority,
 * owner, planned downtime, note. The shared schema checks each field beside it; the server's
 * refusals (a planned finding without its work order) land beside their field too.
 */
export function FindingFormDialog({
  open,
  heading,
  headingId,
  context,
  values,
  submitLabel,
  busy,
  error,
  onSubmit,
  onClose,
}: {
  open: boolean;
  heading: string;
  headingId: string;
  context?: string | undefined;
  values: FindingFormInput;
  submitLabel: string;
  busy: boolean;
  error: Error | null;
  /** Saves; a rejection with field errors marks the fields. */
  onSubmit: (values: FindingFormOutput) => Promise<unknown>;
  onClose: () => void;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const form = useForm<FindingFormInput, unknown, FindingFormOutput>({
    resolver: zodResolver(findingFormSchema),
    defaultValues: values,
  });
  const { errors } = form.formState;

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open) {
      form.reset(values);
      if (!dialog.open) dialog.showModal();
    } else if (dialog.open) {
      dialog.close();
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [open]);

  const submit = form.handleSubmit((v) =>
    onSubmit(v).catch((e: unknown) => {
      const byField = fieldErrorsOf(e);
      for (const f of fields) if (byField[f]) form.setError(f, { message: byField[f] });
    }),
  );
  const serverError = error && Object.keys(fieldErrorsOf(error)).length === 0;

  return (
    <dialog
      ref={ref}
      aria-labelledby={headingId}
      onClose={onClose}
      className="m-auto w-[min(34rem,calc(100vw-2rem))] rounded-lg border border-line bg-surface p-0 text-ink shadow-xl backdrop:bg-ink/30"
    >
      <form onSubmit={submit} noValidate className="flex flex-col gap-4 p-5">
        <div>
          <h2 id={headingId} className="text-base font-semibold">
            {heading}
          </h2>
          {context && <p className="mt-1 text-xs text-ink-muted">{context}</p>}
        </div>
        {serverError && (
          <p role="alert" className="rounded-md bg-danger-soft px-3 py-2 text-sm">
            {error.message}
          </p>
        )}
        <InputField label="Title" autoFocus {...formField(form, 'title')} />
        <div className="grid gap-4 sm:grid-cols-2">
          <FormFields form={form} fields={referenceFields} />
        </div>
        <div className="grid gap-4 sm:grid-cols-3">
          <FormFields form={form} fields={workFields} />
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
          <Button type="submit" variant="primary" busy={busy}>
            {submitLabel}
          </Button>
        </div>
      </form>
    </dialog>
  );
}
