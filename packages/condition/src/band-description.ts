/**
 * What a band measures, in one plain sentence for people who do not read limit sets (the
 * operator's alert detail). Wording is ours; the fault-frequency names are the usual ones
 * (Randall & Antoni 2011 for the bearing frequencies), the rest common practice, no source.
 */
import type { BandDefinition, BandSpectrum, FaultFrequencyName } from './band-definition.ts';

const SPECTRUM_WORDS: Record<BandSpectrum, string> = {
  acceleration: 'acceleration',
  velocity: 'vibration velocity',
  displacement: 'shaft or casing displacement',
  envelope: 'envelope (demodulated acceleration, where rolling-bearing impacts show)',
};

const MEASURE_WORDS = { rms: 'RMS', peak: 'peak', 'peak-to-peak': 'peak-to-peak' } as const;

const FAULT_WORDS: Record<FaultFrequencyName, string> = {
  '1x': 'once per revolution (1×), where unbalance and a bent shaft show',
  '2x': 'twice per revolution (2×), where misalignment and looseness show',
  '3x': 'three times per revolution (3×), where misalignment and looseness show',
  bpfo: "the bearing's outer-race defect frequency",
  bpfi: "the bearing's inner-race defect frequency",
  bsf: "the bearing's rolling-element defect frequency",
  ftf: "the bearing's cage frequency",
  'gear-mesh': 'the gear-mesh frequency (teeth × shaft speed), where tooth wear shows',
  'blade-pass': 'the blade or vane pass frequency, where flow problems show',
};

/** "1", "2.5", "0.75": short numbers for a sentence. */
const n = (v: number) => String(Number(v.toPrecision(3)));

/** One sentence: which quantity the band follows and where in the spectrum. */
export function describeBand(band: BandDefinition): string {
  const what = `${MEASURE_WORDS[band.measure]} ${SPECTRUM_WORDS[band.spectrum]}`;
  switch (band.kind) {
    case 'overall': {
      const span =
        band.fromHz !== undefined && band.toHz !== undefined
          ? ` from ${n(band.fromHz)} to ${n(band.toHz)} Hz`
          : '';
      const iso =
        band.spectrum === 'velocity' && band.measure === 'rms'
          ? ' — the quantity ISO 20816 judges a machine by'
          : '';
      return `How strongly the machine vibrates in all: the overall ${what}${span}${iso}.`;
    }
    case 'hz':
      return `The ${what} between ${n(band.fromHz)} and ${n(band.toHz)} Hz.`;
    case 'order': {
      const speeds = `${n(band.fromOrder)}× and ${n(band.toOrder)}× running speed`;
      const at1x = band.fromOrder <= 1 && band.toOrder > 1 ? ', where unbalance shows' : '';
      return `The ${what} between ${speeds}${at1x}.`;
    }
    case 'fault': {
      const harmonics =
        (band.harmonics ?? 1) > 1 ? ` and its first ${band.harmonics} harmonics` : '';
      return `The ${what} close to ${FAULT_WORDS[band.fault]}${harmonics}.`;
    }
  }
}
