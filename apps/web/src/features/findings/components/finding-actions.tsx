import { zodResolver } from '@hookform/resolvers/zod';
import { workOrderRefSchema, type Finding, type FindingState } from '@turnstone/contracts/findings';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { Button } from '../../../components/ui/button.tsx';
import { Input } from '../../../components/ui/field.tsx';
import { fieldErrorsOf } from '../../../lib/api-client.ts';
import { useUpdateFinding } from '../api/update-finding.ts';

/**
 * A finding's controls: edit its fields, and its state: open → planned (needs a work order)
 * → done, and reopen.
 */

const planSchema = z.object({
  workOrderRef: workOrderRefSchema.min(1, 'Give the work-order reference'),
});

/** Asks for the work-order reference a finding needs before it can be marked planned. */
function PlanForm({ finding, onDone }: { finding: Finding; onDone: () => void }) {
  const update = useUpdateFinding();
  const form = useForm<z.input<typeof planSchema>, unknown, z.output<typeof planSchema>>({
    resolver: zodResolver(planSchema),
    defaultValues: { workOrderRef: '' },
  });
  const error = form.formState.errors.workOrderRef?.message;
  const submit = form.handleSubmit((v) =>
    update
      .mutateAsync({ id: finding.id, state: 'planned', workOrderRef: v.workOrderRef })
      .then(onDone, (e: unknown) =>
        form.setError('workOrderRef', {
          message: fieldErrorsOf(e).workOrderRef ?? (e instanceof Error ? e.message : 'Failed'),
        }),
      ),
  );
  const id = `plan-${finding.id}`;
  return (
    <form onSubmit={submit} noValidate className="mt-2 flex flex-wrap items-start gap-2">
      <label htmlFor={id} className="sr-only">
        Work-order reference for {finding.title}
      </label>
      <div>
        <Input
          id={id}
          {...form.register('workOrderRef')}
          controlSize="sm"
          placeholder="Work-order reference"
          className="w-52 font-mono"
          invalid={Boolean(error)}
          aria-describedby={error ? `${id}-error` : undefined}
          autoFocus
        />
        {error && (
          <p id={`${id}-error`} className="mt-1 text-xs font-medium text-status-danger">
            {error}
          </p>
        )}
      </div>
      <Button type="submit" size="sm" variant="primary" busy={update.isPending}>
        Mark planned
      </Button>
      <Button size="sm" variant="ghost" onClick={onDone}>
        Cancel
      </Button>
    </form>
  );
}

export function StateActions({ finding, onEdit }: { finding: Finding; onEdit: () => void }) {
  const update = useUpdateFinding();
  const [planning, setPlanning] = useState(false);
  const move = (state: FindingState) => update.mutate({ id: finding.id, state });
  return (
    <div data-print="hide">
      <div className="flex flex-wrap justify-end gap-1.5">
        <Button size="sm" variant="ghost" onClick={onEdit} aria-label={`Edit: ${finding.title}`}>
          Edit
        </Button>
        {finding.state === 'open' && (
          <Button
            size="sm"
            onClick={() => (finding.workOrderRef ? move('planned') : setPlanning(true))}
            aria-label={`Mark planned: ${finding.title}`}
          >
            Mark planned
          </Button>
        )}
        {finding.state !== 'done' && (
          <Button size="sm" onClick={() => move('done')} aria-label={`Mark done: ${finding.title}`}>
            Mark done
          </Button>
        )}
        {finding.state === 'done' && (
          <Button size="sm" variant="ghost" onClick={() => move('open')}>
            Reopen
          </Button>
        )}
      </div>
      {planning && finding.state === 'open' && (
        <PlanForm finding={finding} onDone={() => setPlanning(false)} />
      )}
      {update.error && (
        <p role="alert" className="mt-1 text-right text-xs text-status-danger">
          {update.error.message}
        </p>
      )}
    </div>
  );
}
