import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { acknowledgeRequestSchema, type AcknowledgeRequest } from '@turnstone/contracts/alerts';
import { Button } from '../../../components/ui/button.tsx';
import { Field } from '../../../components/ui/field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { cn } from '../../../lib/cn.ts';
import { useAcknowledgeAlerts } from '../api/acknowledge-alerts.ts';

/** Where Enter on a selected row's box takes the focus: the list's note field. */
const LIST_NOTE = 'textarea[data-acknowledge-note="list"]';

/** Moves the focus to the list's note field once it is drawn (after the selection renders). */
export function focusAcknowledgeNote() {
  requestAnimationFrame(() => document.querySelector<HTMLElement>(LIST_NOTE)?.focus());
}

/** The note and the button that acknowledge the selected alerts. */
export function AcknowledgeForm({
  ids,
  label,
  userName,
  onDone,
}: {
  ids: number[];
  /** The note's label; by default it speaks of the selection in the table. */
  label?: string;
  userName: string;
  onDone: (message: string) => void;
}) {
  const mutation = useAcknowledgeAlerts({
    userName,
    onAcknowledged: (count) =>
      onDone(count === 1 ? 'Alert acknowledged.' : `${count} alerts acknowledged.`),
  });
  const form = useForm<AcknowledgeRequest>({
    resolver: zodResolver(acknowledgeRequestSchema),
    defaultValues: { note: '' },
  });
  const submit = form.handleSubmit((values) => {
    mutation.mutate({ ids, note: values.note }, { onSuccess: () => form.reset({ note: '' }) });
  });
  const error = mutation.error;
  if (ids.length === 0)
    return (
      <div className="flex flex-col gap-1">
        <p className="text-sm text-ink-muted">
          Select raised alerts in the list to acknowledge them with a note (Enter on a box selects
          it and comes here).
        </p>
        {error && (
          <p role="alert" className="text-sm text-status-danger">
            {error.message}
          </p>
        )}
      </div>
    );
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" noValidate>
      <Field
        label={
          label ??
          (ids.length === 1
            ? 'Note for the selected alert'
            : `Note for the ${ids.length} selected alerts`)
        }
        hint="What you saw or did, e.g. “Checked on site, noise normal; told the shift lead.”"
        error={form.formState.errors.note?.message}
      >
        {(control) => (
          <textarea
            {...control}
            {...form.register('note')}
            aria-invalid={control.invalid || undefined}
            rows={3}
            data-acknowledge-note={label ? undefined : 'list'}
            className={cn(
              'block w-full rounded-md border bg-surface px-3 py-2 text-sm text-ink placeholder:text-ink-faint focus-visible:border-accent',
              control.invalid ? 'border-status-danger' : 'border-line-strong',
            )}
          />
        )}
      </Field>
      {error && (
        <p role="alert" className="text-sm text-status-danger">
          {isApiError(error) && error.status === 409
            ? `${error.message} The list has been refreshed.`
            : error.message}
        </p>
      )}
      <div>
        <Button
          type="submit"
          variant="primary"
          busy={mutation.isPending}
          disabled={ids.length === 0}
        >
          Acknowledge {ids.length > 1 ? `${ids.length} alerts` : 'alert'}
        </Button>
      </div>
    </form>
  );
}
