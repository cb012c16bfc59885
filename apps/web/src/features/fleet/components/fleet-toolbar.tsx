import type { NodeStatus } from '@turnstone/contracts/fleet';
import { useId } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { FilterSelect, Input, type SelectOption } from '../../../components/ui/field.tsx';
import { Ring, StrokePath } from '../../../components/ui/icon.tsx';
import { isNodeStatus, statusLabels, statusOrder } from '../../../lib/node-status.ts';

export function FleetToolbar({
  query,
  onQueryChange,
  status,
  onStatusChange,
  onExpandAll,
  onCollapseMachines,
  resultText,
}: {
  query: string;
  onQueryChange: (query: string) => void;
  status: NodeStatus | null;
  onStatusChange: (status: NodeStatus | null) => void;
  onExpandAll: () => void;
  onCollapseMachines: () => void;
  resultText: string;
}) {
  const id = useId();
  return (
    <div className="flex flex-wrap items-end gap-x-3 gap-y-2">
      <div className="flex min-w-56 flex-1 flex-col gap-1 lg:max-w-md">
        <label htmlFor={`${id}-q`} className="text-xs font-medium text-ink-muted">
          Search machines and points
        </label>
        <div className="relative">
          <svg
            viewBox="0 0 16 16"
            aria-hidden="true"
            className="pointer-events-none absolute top-1/2 left-2.5 size-4 -translate-y-1/2 text-ink-faint"
          >
            <Ring cx={7} r={4.5} width={1.5} />
            <StrokePath d="m10.5 10.5 3 3" width={1.5} />
          </svg>
          <Input
            id={`${id}-q`}
            type="search"
            value={query}
            onChange={(event) => onQueryChange(event.target.value)}
            placeholder="Name or tag, e.g. P-101"
            autoComplete="off"
            spellCheck={false}
            controlSize="sm"
            className="pl-8"
          />
        </div>
      </div>
      <FilterSelect
        label="Status"
        options={[
          ['', 'All statuses'],
          ...statusOrder.map((s): SelectOption => [s, statusLabels[s]]),
        ]}
        value={status ?? ''}
        onChange={(event) => {
          const value = event.target.value;
          onStatusChange(isNodeStatus(value) ? value : null);
        }}
        className="w-44 font-normal"
      />
      <div className="flex items-center gap-1">
        <Button size="sm" variant="ghost" onClick={onExpandAll}>
          Expand all
        </Button>
        <Button size="sm" variant="ghost" onClick={onCollapseMachines}>
          Collapse to machines
        </Button>
      </div>
      <p role="status" className="ml-auto pb-2 text-xs text-ink-muted">
        {resultText}
      </p>
    </div>
  );
}
