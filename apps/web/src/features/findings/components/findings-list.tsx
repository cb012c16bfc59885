import { findingPriorityLabels, type FindingState } from '@turnstone/contracts/findings';
import { isoWeekDays, isoWeekOf } from '@turnstone/contracts/dates';
import { useState } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { PointLabel } from '../../../components/ui/text-link.tsx';
import { TableHead } from '../../../components/ui/table-head.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { Input, Select } from '../../../components/ui/field.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { formatDate } from '../../../lib/format.ts';
import { formatNumber } from '@turnstone/contracts/number-format';
import { useFindings } from '../api/get-findings.ts';
import { FindingStateMark } from './finding-state-mark.tsx';
import { StateActions } from './finding-actions.tsx';
import { EditFindingDialog } from './edit-finding-dialog.tsx';

type Show = 'active' | FindingState | 'all';
const showLabels: Record<Show, string> = {
  active: 'Open and planned',
  open: 'Open',
  planned: 'Planned',
  done: 'Done',
  all: 'All',
};

/** Today in the screen's zone, for "overdue" and "this week". */
const localToday = () => formatDate(Date.now());

/**
 * The findings of the sites in view, with their controls: edit (priority, owner, planned
 * downtime, …) and state (open → planned → done).
 */
const columns = ['Finding', 'Point', 'Priority', 'Owner', 'Downtime', 'State', 'Work order', 'Due'];

export function FindingsList({
  siteId,
  canEdit,
}: {
  siteId?: number | undefined;
  canEdit: boolean;
}) {
  const [show, setShow] = useState<Show>('active');
  const [dueWeek, setDueWeek] = useState('');
  const [editing, setEditing] = useState<number | null>(null);
  const week = isoWeekDays(dueWeek) ? dueWeek : undefined;
  const findings = useFindings({
    siteId,
    state: show === 'all' || show === 'active' ? undefined : show,
    dueWeek: week,
  });
  const today = localToday();
  const thisWeek = isoWeekOf(today);
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
          <div data-print="hide" className="flex flex-wrap items-center gap-2">
            <label htmlFor="findings-show" className="text-xs text-ink-muted">
              State
            </label>
            <div className="w-52">
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
            <label htmlFor="findings-week" className="ml-2 text-xs text-ink-muted">
              Due in week
            </label>
            <div className="w-44">
              <Input
                id="findings-week"
                type="week"
                controlSize="sm"
                className="w-44 font-mono"
                value={dueWeek}
                onChange={(e) => setDueWeek(e.target.value)}
              />
            </div>
            <Button size="sm" variant="ghost" onClick={() => setDueWeek(thisWeek)}>
              This week
            </Button>
            {dueWeek && (
              <Button size="sm" variant="ghost" onClick={() => setDueWeek('')}>
                Any week
              </Button>
            )}
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
              ? 'No open or planned findings. Use “Create finding” on any row below.'
              : 'No findings to show.'}
          </p>
        ) : (
          <div className="review-scroll overflow-x-auto">
            <table className="review-table w-full border-collapse">
              <TableHead
                look="band"
                columns={columns}
                actions={
                  canEdit ? { label: 'Actions', visible: false, printHidden: true } : undefined
                }
              />
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
                        <PointLabel
                          pointId={f.pointId}
                          title={f.pointTag}
                          titleIs="tag"
                          detail={f.machineName}
                        />
                      </td>
                      <td className="px-3 py-2 align-top text-[13px] text-ink">
                        <span className={f.priority === 'high' ? 'font-semibold' : undefined}>
                          {findingPriorityLabels[f.priority]}
                        </span>
                      </td>
                      <td className="px-3 py-2 align-top text-[13px] text-ink">
                        {f.owner ?? <span className="text-ink-faint">—</span>}
                      </td>
                      <td className="px-3 py-2 align-top text-right font-mono text-[13px] whitespace-nowrap text-ink">
                        {f.plannedDowntimeHours === null ? (
                          <span className="text-ink-faint">—</span>
                        ) : (
                          `${formatNumber(f.plannedDowntimeHours)} h`
                        )}
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
                          <StateActions finding={f} onEdit={() => setEditing(f.id)} />
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
      {canEdit && (
        <EditFindingDialog
          finding={items.find((f) => f.id === editing) ?? null}
          onClose={() => setEditing(null)}
        />
      )}
    </Card>
  );
}
