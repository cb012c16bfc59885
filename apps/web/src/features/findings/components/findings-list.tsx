import { zodResolver } from '@hookform/resolvers/zod';
import { workOrderRefSchema, type Finding, type FindingState } from '@turnstone/contracts/findings';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { z } from 'zod';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { Input, Select } from '../../../components/ui/field.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { paths } from '../../../config/paths.ts';
import { fieldErrorsOf } from '../../../lib/api-client.ts';
import { useFindings } from '../api/get-findings.ts';
import { useUpdateFinding } from '../api/update-finding.ts';
import { FindingStateMark } from './finding-state-mark.tsx';

type Show = 'active' | FindingState | 'all';
const showLabels: Record<Show, string> = {
  active: 'Open and planned',
  open: 'Open',
  planned: 'Planned',
  done: 'Done',
  all: 'All',
};

const localToday = () => {
  const d = new Date();
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
};

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

function StateActions({ finding }: { finding: Finding }) {
  const update = useUpdateFinding();
  const [planning, setPlanning] = useState(false);
  const move = (state: FindingState) => update.mutate({ id: finding.id, state });
  return (
    <div data-print="hide">
      <div className="flex flex-wrap justify-end gap-1.5">
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

/** The findings of the sites in view, with their state controls (open → planned → done). */
export function FindingsList({
  siteId,
  canEdit,
}: {
  siteId?: number | undefined;
  canEdit: boolean;
}) {
  const [show, setShow] = useState<Show>('active');
  const findings = useFindings({ siteId });
  const today = localToday();
  const items = (findings.data?.items ?? []).filter((f) =>
    show === 'all' ? true : show === 'active' ? f.state !== 'done' : f.state === show,
  );

  return (
    <Card className="review-section overflow-hidden">
      <section id="findings" aria-labelledby="findings-title" className="scroll-mt-4">
        <div className="flex flex-wrap items-center justify-between gap-2 border-b border-line px-4 py-3">
          <h2 id="findings-title" className="text-[15px] font-semibold text-ink">
            Findings{' '}
            <span className="font-mono text-sm font-normal text-ink-muted">({items.length})</span>
          </h2>
          <div data-print="hide" className="flex items-center gap-2">
            <label htmlFor="findings-show" className="text-xs text-ink-muted">
              Show
            </label>
            <Select
              id="findings-show"
              className="w-44"
              value={show}
              onChange={(e) => setShow(e.target.value as Show)}
            >
              {(Object.keys(showLabels) as Show[]).map((k) => (
                <option key={k} value={k}>
                  {showLabels[k]}
                </option>
              ))}
            </Select>
          </div>
        </div>
        {findings.isPending ? (
          <LoadingPanel label="Loading findings…" />
        ) : findings.isError ? (
          <ErrorState
            title="Could not load the findings"
            error={findings.error}
            onRetry={() => void findings.refetch()}
            retrying={findings.isFetching}
          />
        ) : items.length === 0 ? (
          <p className="px-4 py-6 text-center text-sm text-ink-muted">
            {show === 'active'
              ? 'No open or planned findings. Use “Create finding” on any row above.'
              : 'No findings to show.'}
          </p>
        ) : (
          <div className="review-scroll overflow-x-auto">
            <table className="review-table w-full border-collapse">
              <thead className="bg-sunken/60">
                <tr>
                  {['Finding', 'Point', 'State', 'Work order', 'Due'].map((h) => (
                    <th
                      key={h}
                      className="px-3 py-2 text-left text-xs font-medium whitespace-nowrap text-ink-muted"
                    >
                      {h}
                    </th>
                  ))}
                  {canEdit && (
                    <th data-print="hide" className="px-3 py-2">
                      <span className="sr-only">Actions</span>
                    </th>
                  )}
                </tr>
              </thead>
              <tbody className="divide-y divide-line">
                {items.map((f) => {
                  const overdue = f.state !== 'done' && f.dueDate !== null && f.dueDate < today;
                  return (
                    <tr key={f.id} data-finding-id={f.id}>
                      <td className="px-3 py-2 align-top text-[13px] text-ink">
                        <p className="font-medium">{f.title}</p>
                        {f.note && <p className="text-xs text-ink-muted">{f.note}</p>}
                        <p className="text-xs text-ink-faint">by {f.createdBy.name}</p>
                      </td>
                      <td className="px-3 py-2 align-top text-[13px]">
                        <Link
                          to={paths.app.point.getHref(f.pointId)}
                          className="font-mono font-medium whitespace-nowrap text-accent underline-offset-2 hover:underline"
                        >
                          {f.pointTag}
                        </Link>
                        <div className="text-xs text-ink-muted">{f.machineName}</div>
                      </td>
                      <td className="px-3 py-2 align-top">
                        <FindingStateMark state={f.state} />
                      </td>
                      <td className="px-3 py-2 align-top font-mono text-[13px] whitespace-nowrap text-ink">
                        {f.workOrderRef ?? <span className="text-ink-faint">—</span>}
                      </td>
                      <td className="px-3 py-2 align-top font-mono text-[13px] whitespace-nowrap text-ink">
                        {f.dueDate ?? <span className="text-ink-faint">—</span>}
                        {overdue && (
                          <div className="flex items-center gap-1 font-sans text-xs font-medium text-status-danger">
                            <svg viewBox="0 0 12 12" aria-hidden="true" className="size-2.5">
                              <path d="M6 1 11 10H1Z" fill="currentColor" />
                            </svg>
                            Overdue
                          </div>
                        )}
                      </td>
                      {canEdit && (
                        <td data-print="hide" className="px-3 py-2 align-top">
                          <StateActions finding={f} />
                        </td>
                      )}
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
      </section>
    </Card>
  );
}
