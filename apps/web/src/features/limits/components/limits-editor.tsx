import { useDeferredValue, useEffect, useMemo, useRef, useState } from 'react';
import { useFieldArray, useForm, type Resolver } from 'react-hook-form';
import { useBlocker } from 'react-router-dom';
import type {
  BandDefinitionInput,
  LimitSetResponse,
  ReplayResponse,
} from '@turnstone/contracts/limits';
import { Button } from '../../../components/ui/button.tsx';
import { Card } from '../../../components/ui/card.tsx';
import { Field } from '../../../components/ui/field.tsx';
import { Modal } from '../../../components/ui/modal.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { cn } from '../../../lib/cn.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { registerUnsavedChanges } from '../../../lib/unsaved-changes.ts';
import { getIsoDefaults } from '../api/get-limits.ts';
import { useReplayLimits, useSaveLimitsTarget, type LimitsTarget } from '../api/save-limits.ts';
import {
  checkForm,
  emptyBand,
  formPathOf,
  nestErrors,
  reasonSchema,
  toFormBand,
  type LimitsFormValues,
} from '../utils/band-form.ts';
import { levelForInput } from '@turnstone/contracts/units';
import { NEW_BAND_RULES } from '@turnstone/condition/band-definition';
import { useUnits } from '../../account/api/use-units.ts';
import { BandFields } from './band-fields.tsx';
import { LimitHistoryList } from './limit-history-list.tsx';
import { ReplaySummary } from './replay-summary.tsx';

/**
 * The bands a first screen shows: the editor opens with these, and the bands below them (a
 * demo point has eight, each some hundred fields, labels and options) follow in a background
 * render right after, so the first screen does not wait for fields out of sight.
 */
const FIRST_BANDS = 2;

/** The band editor of one point: edit, apply defaults, replay, save with a reason. */
export function LimitsEditor({
  limits,
  target,
  onSaved,
}: {
  limits: Pick<LimitSetResponse, 'bands' | 'version'> &
    Partial<Pick<LimitSetResponse, 'updatedAt' | 'updatedBy'>>;
  target: LimitsTarget;
  /** Told the outcome of a save (the editor is remounted with the new version after it). */
  onSaved: (message: string) => void;
}) {
  const pointId = target.kind === 'point' ? target.pointId : null;
  const originals = limits.bands;
  // Levels are typed and shown in the user's unit system, stored in metric (band-form.ts).
  const units = useUnits();
  const resolver = useMemo<Resolver<LimitsFormValues>>(
    () => (values) => {
      const checked = checkForm(values, originals, units.system);
      return checked.ok
        ? { values, errors: {} }
        : { values: {}, errors: nestErrors(checked.errors) };
    },
    [originals, units.system],
  );
  const form = useForm<LimitsFormValues>({
    resolver,
    defaultValues: { bands: limits.bands.map((b) => toFormBand(b, units.system)) },
  });
  const bands = useFieldArray({ control: form.control, name: 'bands' });
  // False on the first render only: then every band renders, in a render React may interrupt.
  const allBands = useDeferredValue(true, false);
  const shownBands = allBands ? bands.fields : bands.fields.slice(0, FIRST_BANDS);
  const replay = useReplayLimits(pointId ?? 0);
  const save = useSaveLimitsTarget(target);
  const [replayed, setReplayed] = useState<ReplayResponse | null>(null);
  const [iso, setIso] = useState<{ busy: boolean; text: string | null }>({
    busy: false,
    text: null,
  });
  const [reason, setReason] = useState('');
  const [reasonError, setReasonError] = useState<string | null>(null);
  const [asking, setAsking] = useState(false);
  const replayRef = useRef<HTMLDivElement>(null);
  const saveButton = useRef<HTMLButtonElement>(null);
  const reasonBox = useRef<HTMLTextAreaElement>(null);
  // Where the focus goes when the reason field opens or closes (the button it replaces is gone).
  const [focusAfter, setFocusAfter] = useState<'reason' | 'save' | null>(null);
  useEffect(() => {
    if (focusAfter === 'reason') reasonBox.current?.focus();
    if (focusAfter === 'save') saveButton.current?.focus();
  }, [focusAfter, asking]);

  const definitions = (values: LimitsFormValues): BandDefinitionInput[] => {
    const checked = checkForm(values, originals, units.system);
    return checked.ok ? checked.bands : [];
  };

  const serverErrors = (error: unknown) => {
    if (isApiError(error) && error.status === 400 && Array.isArray(error.details)) {
      for (const d of error.details as { path: string; message: string }[]) {
        const path = formPathOf(d.path);
        if (path !== 'root')
          form.setError(path as `bands.${number}.alertLevel`, { message: d.message });
      }
    }
  };

  const onReplay = form.handleSubmit((values) => {
    replay.mutateAsync(definitions(values)).then(setReplayed, serverErrors);
  });

  const onSave = form.handleSubmit((values) => {
    const r = reasonSchema.safeParse(reason);
    if (!r.success) {
      setReasonError(r.error.issues[0]?.message ?? 'Say why.');
      return;
    }
    setReasonError(null);
    // mutateAsync, not mutate's callbacks: the save refetches the limit set, and its new
    // version remounts this editor; TanStack Query drops the callbacks of an unmounted
    // observer, which would lose the outcome. The parent keeps the message.
    save.mutateAsync({ bands: definitions(values), reason: r.data }).then((out) => {
      onSaved(
        `Saved as version ${out.version}.` +
          (out.clearedAlertIds.length
            ? ` ${out.clearedAlertIds.length} open alert(s) on removed bands were cleared.`
            : ''),
      );
      setAsking(false);
      setReason('');
      form.reset(values);
    }, serverErrors);
  });

  const applyIso = async () => {
    if (pointId === null) return;
    setIso({ busy: true, text: null });
    try {
      const d = await getIsoDefaults(pointId);
      const list = form.getValues('bands');
      const source = `ISO 20816-3 group ${d.isoGroup}, ${d.foundation}: alert B/C, danger C/D`;
      let applied = 0;
      list.forEach((b, i) => {
        if (b.kind === 'overall' && b.spectrum === 'velocity' && b.measure === 'rms') {
          // Shown rounded in the user's units; the ISO values themselves are what is saved.
          const shown = (v: number) => levelForInput(v, 'mm/s', units.system);
          form.setValue(`bands.${i}.alertLevel`, shown(d.alertLevel), { shouldDirty: true });
          form.setValue(`bands.${i}.dangerLevel`, shown(d.dangerLevel), { shouldDirty: true });
          form.setValue(`bands.${i}.alertLevelStored`, d.alertLevel);
          form.setValue(`bands.${i}.dangerLevelStored`, d.dangerLevel);
          form.setValue(`bands.${i}.levelSource`, source, { shouldDirty: true });
          applied++;
        }
      });
      if (applied === 0)
        bands.append(
          toFormBand(
            {
              key: 'overall-velocity',
              name: 'Overall velocity (ISO 20816)',
              kind: 'overall',
              spectrum: 'velocity',
              measure: 'rms',
              unit: 'mm/s',
              alertLevel: d.alertLevel,
              dangerLevel: d.dangerLevel,
              ...NEW_BAND_RULES,
              levelSource: source,
            },
            units.system,
          ),
        );
      setIso({
        busy: false,
        text: `ISO 20816-3 group ${d.isoGroup}, ${d.foundation} foundation: alert ${units.format(d.alertLevel, 'mm/s')}, danger ${units.format(d.dangerLevel, 'mm/s')} applied to the overall velocity band. ${d.source}`,
      });
    } catch (err) {
      setIso({
        busy: false,
        text: err instanceof Error ? err.message : 'Could not load the ISO defaults.',
      });
    }
  };

  const dirty = form.formState.isDirty;
  const unsaved = dirty || bands.fields.length !== limits.bands.length;
  useEffect(() => {
    if (replayed) replayRef.current?.scrollIntoView({ block: 'start', behavior: 'smooth' });
  }, [replayed]);

  // Unsaved edits are never dropped silently: another point, the other tab, another page
  // (blocked route changes), signing out (asks through registerUnsavedChanges) and closing
  // or reloading the page (the browser's own question) all ask first.
  const discarding = useRef(false);
  const blocker = useBlocker(
    ({ currentLocation: from, nextLocation: to }) =>
      unsaved &&
      !discarding.current &&
      (from.pathname !== to.pathname || from.search !== to.search),
  );
  const [asked, setAsked] = useState<((discard: boolean) => void) | null>(null);
  useEffect(() => {
    if (!unsaved) return;
    const unregister = registerUnsavedChanges(
      () => new Promise<boolean>((resolve) => setAsked(() => resolve)),
    );
    const onUnload = (e: BeforeUnloadEvent) => e.preventDefault();
    window.addEventListener('beforeunload', onUnload);
    return () => {
      unregister();
      window.removeEventListener('beforeunload', onUnload);
    };
  }, [unsaved]);
  const leaveOpen = blocker.state === 'blocked' || asked !== null;
  const answerLeave = (discard: boolean) => {
    if (discard) discarding.current = true;
    if (blocker.state === 'blocked') {
      if (discard) blocker.proceed();
      else blocker.reset();
    }
    asked?.(discard);
    setAsked(null);
  };

  return (
    <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_22rem]">
      <Modal
        open={leaveOpen}
        title="Discard the unsaved limit changes?"
        onClose={() => {
          if (leaveOpen) answerLeave(false);
        }}
      >
        <p className="text-sm text-ink-muted">
          The bands have changes that are not saved. Keep editing to replay or save them, or discard
          them and go on.
        </p>
        <div className="flex justify-end gap-2">
          <Button onClick={() => answerLeave(false)}>Keep editing</Button>
          <Button className="text-status-danger" onClick={() => answerLeave(true)}>
            Discard changes
          </Button>
        </div>
      </Modal>
      {replayed && (
        <div ref={replayRef} className="xl:col-span-2">
          <Card className="flex scroll-mt-4 flex-col gap-3 p-4 xl:col-span-2">
            <h2 className="text-sm font-semibold text-ink">Replay of the proposed levels</h2>
            <ReplaySummary replay={replayed} current={limits.bands} />
          </Card>
        </div>
      )}
      {/* Before the bands in Tab order (after them on screen): Replay and Save are reached at once. */}
      <div className="order-last flex flex-col gap-4">
        <Card className="flex flex-col gap-3 p-4 xl:sticky xl:top-0">
          <h2 className="text-sm font-semibold text-ink">Check, then save</h2>
          {pointId !== null ? (
            <>
              <p className="text-xs text-ink-muted">
                Replay runs the proposed bands over this point’s stored history with the same rules
                the worker uses.
              </p>
              <Button onClick={() => void onReplay()} busy={replay.isPending}>
                Replay history
              </Button>
              <p role="status" className="sr-only">
                {replayed
                  ? `Replay done: ${replayed.totals.alerts} alert(s) over ${replayed.snapshots} snapshot(s), ${replayed.totals.reachedDanger} reaching danger. The details are above the bands.`
                  : ''}
              </p>
              {replay.error && (
                <p role="alert" className="text-sm text-status-danger">
                  {replay.error.message}
                </p>
              )}
            </>
          ) : (
            <p className="text-xs text-ink-muted">
              A template applies to points of this machine type measured for the first time; points
              that already have limits keep theirs. Its levels are the same for every machine of the
              type, whatever its ISO 20816 group: check them per machine.
            </p>
          )}
          {!asking ? (
            <Button
              ref={saveButton}
              variant="primary"
              onClick={() => {
                setAsking(true);
                setFocusAfter('reason');
              }}
              disabled={!unsaved}
            >
              Save limits…
            </Button>
          ) : (
            <div className="flex flex-col gap-2">
              <Field
                label="Reason for the change"
                error={reasonError ?? undefined}
                hint="Kept in the audit log with your name."
              >
                {(c) => (
                  <textarea
                    {...c}
                    ref={reasonBox}
                    aria-invalid={c.invalid || undefined}
                    rows={3}
                    value={reason}
                    onChange={(e) => setReason(e.target.value)}
                    className={cn(
                      'block w-full rounded-md border bg-surface px-3 py-2 text-sm text-ink focus-visible:border-accent',
                      c.invalid ? 'border-status-danger' : 'border-line-strong',
                    )}
                  />
                )}
              </Field>
              <div className="flex gap-2">
                <Button variant="primary" onClick={() => void onSave()} busy={save.isPending}>
                  Save with this reason
                </Button>
                <Button
                  variant="ghost"
                  onClick={() => {
                    setAsking(false);
                    setFocusAfter('save');
                  }}
                >
                  Cancel
                </Button>
              </div>
            </div>
          )}
          {save.error && (
            <p role="alert" className="text-sm text-status-danger">
              {save.error.message}
            </p>
          )}
        </Card>
        {pointId !== null && (
          <Card className="flex flex-col gap-3 p-4">
            <h2 className="text-sm font-semibold text-ink">Recent changes</h2>
            <LimitHistoryList pointId={pointId} />
          </Card>
        )}
      </div>
      <form className="flex min-w-0 flex-col gap-4" noValidate onSubmit={(e) => e.preventDefault()}>
        <div className="flex flex-wrap items-center gap-2">
          {pointId !== null && (
            <Button onClick={() => void applyIso()} busy={iso.busy}>
              Apply ISO 20816 defaults
            </Button>
          )}
          <Button onClick={() => bands.append(emptyBand(bands.fields.length, units.system))}>
            Add band
          </Button>
          <span className="text-xs text-ink-muted">
            Version <span className="font-mono">{limits.version}</span>
            {limits.updatedAt && (
              <>
                {' '}
                · saved {formatDateTime(limits.updatedAt)} by {limits.updatedBy ?? 'Turnstone'}
              </>
            )}
          </span>
        </div>
        {iso.text && (
          <p role="status" className="text-xs text-ink-muted">
            {iso.text}
          </p>
        )}
        {shownBands.map((f, i) => (
          <BandFields
            key={f.id}
            index={i}
            pointId={pointId}
            control={form.control}
            register={form.register}
            setValue={form.setValue}
            errors={form.formState.errors}
            onRemove={() => bands.remove(i)}
          />
        ))}
        {bands.fields.length === 0 && (
          <p className="text-sm text-ink-muted">
            No bands: nothing here would ever raise an alert.
          </p>
        )}
      </form>
    </div>
  );
}
