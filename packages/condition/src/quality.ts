/**
 * Measurement-quality verdict of one snapshot, as produced by the quality checks of
 * `@turnstone/dsp` (clipping, under-range, alias risk, bias, flatline, spikes).
 *
 * - `ok`: values are trusted.
 * - `suspect`: values are evaluated against limits, but every event they cause is marked.
 * - `unusable`: values never raise, escalate or clear anything; they produce a
 *   data-quality notice for the engineer instead.
 *
 * Source: Turnstone DESIGN.md, "The computation", step 2 (project rule, no external source).
 */
export type QualityVerdict = 'ok' | 'suspect' | 'unusable';

/** All verdicts, in order of increasing doubt. Source: Turnstone DESIGN.md. */
export const QUALITY_VERDICTS: readonly QualityVerdict[] = ['ok', 'suspect', 'unusable'];
