import type { Role } from '@turnstone/contracts/roles';
import type { SetupTree } from '@turnstone/contracts/setup';
import { useState, type ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorState } from '../../../components/ui/error-state.tsx';
import { LoadingPanel } from '../../../components/ui/spinner.tsx';
import { paths } from '../../../config/paths.ts';
import { cn } from '../../../lib/cn.ts';
import { useSetup } from '../api/get-setup.ts';
import { AreaForm } from './area-form.tsx';
import { MachineForm } from './machine-form.tsx';
import { PointForm } from './point-form.tsx';
import { SiteForm } from './site-form.tsx';

/** What the right-hand panel edits; no `id` means a new one under `parentId`. */
type Selection =
  | { kind: 'none' }
  | { kind: 'site'; id?: number }
  | { kind: 'area'; id?: number; parentId?: number }
  | { kind: 'machine'; id?: number; parentId?: number }
  | { kind: 'point'; id?: number; parentId: number };

/** A button of the tree, indented by its depth. */
function IndentedButton({
  depth,
  onClick,
  className,
  children,
  ...rest
}: {
  depth: number;
  onClick: () => void;
  className: string;
  children: ReactNode;
  'aria-current'?: true;
}) {
  return (
    <button
      type="button"
      onClick={onClick}
      style={{ paddingLeft: `${0.5 + depth * 1}rem` }}
      className={className}
      {...rest}
    >
      {children}
    </button>
  );
}

function TreeButton({
  selected,
  ...button
}: {
  selected: boolean;
  depth: number;
  onClick: () => void;
  children: ReactNode;
}) {
  return (
    <IndentedButton
      aria-current={selected || undefined}
      className={cn(
        'flex w-full items-baseline gap-2 rounded-md py-1.5 pr-2 text-left text-sm hover:bg-sunken',
        selected && 'bg-accent-soft text-accent-strong',
      )}
      {...button}
    />
  );
}

function AddLink({
  children,
  ...button
}: {
  depth: number;
  onClick: () => void;
  children: ReactNode;
}) {
  return (
    <IndentedButton
      className="block w-full py-1 text-left text-[13px] text-accent hover:underline"
      {...button}
    >
      + {children}
    </IndentedButton>
  );
}

function SetupTreeList({
  tree,
  isAdmin,
  selection,
  select,
}: {
  tree: SetupTree;
  isAdmin: boolean;
  selection: Selection;
  select: (s: Selection) => void;
}) {
  // An entry of the tree: marked while the panel edits it; a click (where allowed) selects it.
  const entry = (target: Selection & { id: number }, allowed = true) => ({
    selected: selection.kind === target.kind && 'id' in selection && selection.id === target.id,
    onClick: () => allowed && select(target),
  });
  return (
    <nav aria-label="Plant tree" className="flex flex-col">
      {tree.sites.map((site) => (
        <div key={site.id} className="border-b border-line py-1 last:border-0">
          <TreeButton depth={0} {...entry({ kind: 'site', id: site.id }, isAdmin)}>
            <span className="font-semibold">{site.name}</span>
            <span className="font-mono text-xs text-ink-faint">{site.code}</span>
          </TreeButton>
          {tree.areas
            .filter((a) => a.siteId === site.id)
            .map((area) => (
              <div key={area.id}>
                <TreeButton depth={1} {...entry({ kind: 'area', id: area.id }, isAdmin)}>
                  <span className="font-medium">{area.name}</span>
                </TreeButton>
                {tree.machines
                  .filter((m) => m.areaId === area.id)
                  .map((m) => (
                    <div key={m.id}>
                      <TreeButton depth={2} {...entry({ kind: 'machine', id: m.id })}>
                        <span>{m.name}</span>
                        <span className="ml-auto font-mono text-xs text-ink-faint">
                          {m.nominalRpm} r/min
                        </span>
                      </TreeButton>
                      {m.points.map((p) => (
                        <TreeButton
                          key={p.id}
                          depth={3}
                          {...entry({ kind: 'point', id: p.id, parentId: m.id })}
                        >
                          <span className="font-mono text-xs">{p.tag}</span>
                          <span className="truncate text-xs text-ink-muted">{p.direction}</span>
                        </TreeButton>
                      ))}
                      <AddLink depth={3} onClick={() => select({ kind: 'point', parentId: m.id })}>
                        Add point to {m.name}
                      </AddLink>
                    </div>
                  ))}
                <AddLink depth={2} onClick={() => select({ kind: 'machine', parentId: area.id })}>
                  Add machine in {area.name}
                </AddLink>
              </div>
            ))}
          {isAdmin && (
            <AddLink depth={1} onClick={() => select({ kind: 'area', parentId: site.id })}>
              Add area to {site.code}
            </AddLink>
          )}
        </div>
      ))}
    </nav>
  );
}

export function SetupExplorer({ role }: { role: Role }) {
  const setup = useSetup();
  const [selection, setSelection] = useState<Selection>({ kind: 'none' });
  const isAdmin = role === 'admin';

  if (setup.isPending) return <LoadingPanel />;
  if (setup.isError)
    return (
      <Card>
        <ErrorState
          error={setup.error}
          onRetry={() => void setup.refetch()}
          retrying={setup.isFetching}
        />
      </Card>
    );
  const tree = setup.data;
  const close = () => setSelection({ kind: 'none' });
  const machineOf = (id: number | undefined) => tree.machines.find((m) => m.id === id);

  let title = '';
  let panel: ReactNode = null;
  const history =
    selection.kind !== 'none' && selection.id !== undefined
      ? { entity: selection.kind, entityId: selection.id }
      : null;
  switch (selection.kind) {
    case 'site': {
      const site = tree.sites.find((s) => s.id === selection.id);
      title = site ? `Site ${site.name}` : 'New site';
      panel = (
        <SiteForm
          key={site?.id ?? 'new'}
          site={site}
          onCancel={close}
          onSaved={(id) => setSelection({ kind: 'site', id })}
        />
      );
      break;
    }
    case 'area': {
      const area = tree.areas.find((a) => a.id === selection.id);
      title = area ? `Area ${area.name}` : 'New area';
      panel = (
        <AreaForm
          key={area?.id ?? `new-${selection.parentId}`}
          area={area}
          sites={tree.sites}
          siteId={selection.parentId}
          onCancel={close}
          onSaved={(id) => setSelection({ kind: 'area', id })}
        />
      );
      break;
    }
    case 'machine': {
      const machine = machineOf(selection.id);
      title = machine ? machine.name : 'New machine';
      panel = (
        <MachineForm
          key={machine?.id ?? `new-${selection.parentId}`}
          machine={machine}
          sites={tree.sites}
          areas={tree.areas}
          areaId={selection.parentId}
          onCancel={close}
          onDeleted={close}
          onSaved={(id) => setSelection({ kind: 'machine', id })}
        />
      );
      break;
    }
    case 'point': {
      const machine = machineOf(selection.parentId);
      const point = machine?.points.find((p) => p.id === selection.id);
      title = point ? `Point ${point.tag}` : 'New point';
      panel = machine ? (
        <PointForm
          key={point?.id ?? `new-${machine.id}`}
          point={point}
          machine={machine}
          onCancel={close}
          onDeleted={close}
          onSaved={(id) => setSelection({ kind: 'point', id, parentId: machine.id })}
        />
      ) : null;
      break;
    }
    case 'none':
      break;
  }

  return (
    <div className="grid min-h-0 flex-1 gap-4 lg:grid-cols-[minmax(18rem,24rem)_1fr]">
      <Card className="min-h-0 overflow-auto p-2">
        {tree.sites.length === 0 ? (
          <EmptyState
            title="No sites yet"
            description={
              isAdmin ? 'Create the first site.' : 'Ask an administrator to assign you a site.'
            }
          />
        ) : (
          <SetupTreeList
            tree={tree}
            isAdmin={isAdmin}
            selection={selection}
            select={setSelection}
          />
        )}
        {isAdmin && (
          <div className="border-t border-line p-2">
            <Button size="sm" onClick={() => setSelection({ kind: 'site' })}>
              New site
            </Button>
          </div>
        )}
      </Card>
      <Card className="min-h-0 overflow-auto p-5">
        {panel ? (
          <section aria-label={title}>
            <div className="mb-4 flex flex-wrap items-baseline justify-between gap-2">
              <h2 className="text-base font-semibold">{title}</h2>
              {history && (
                <Link
                  to={paths.app.audit.getHref(history)}
                  className="text-sm text-accent underline-offset-2 hover:underline"
                >
                  Change history
                </Link>
              )}
            </div>
            {panel}
          </section>
        ) : (
          <EmptyState
            title="Choose something to edit"
            description={
              isAdmin
                ? 'Pick a site, area, machine or point on the left, or add a new one.'
                : 'Pick a machine or point on the left, or add one. Sites and areas are set up by an administrator.'
            }
          />
        )}
      </Card>
    </div>
  );
}
