/**
 * Built-in transient pulses: an exponential open-circuit voltage Voc(t) = baseV + amplitudeV·e^(−t/τ)
 * behind a source resistance (negative pulses: amplitudeV < 0), or a level clamped centrally.
 * decayS follows the "to-10-percent" convention (τ = td/ln 10) unless stated (docs/references.md [M]).
 * Every value names its source: the standard, or "memory" to be confirmed against it.
 */
export interface TransientPulse {
  readonly id: string;
  readonly title: string;
  /** Supply the pulse rides on, V (0: applied with the supply disconnected; "supply": the requirement's nominal). */
  readonly baseV: number | "supply";
  /** Signed amplitude of the exponential above the base, V. */
  readonly amplitudeV: number;
  readonly sourceResistanceOhm: number;
  readonly riseS: number;
  readonly decayS: number;
  readonly decayConvention: "to-10-percent" | "time-constant";
  /** A centrally suppressed pulse: the module input is held at this level for the pulse. */
  readonly clampedAtV?: number;
  readonly source: string;
}

export const TRANSIENT_LIBRARY: readonly TransientPulse[] = [
  {
    id: "iso7637-2-pulse-1-12v",
    title: "ISO 7637-2 pulse 1, 12 V system (inductive load disconnected), −150 V",
    baseV: 0,
    amplitudeV: -150,
    sourceResistanceOhm: 10,
    riseS: 1e-6,
    decayS: 2e-3,
    decayConvention: "to-10-percent",
    source: "ISO 7637-2 pulse 1, 12 V: −75 to −150 V, Ri 10 Ω, td 2 ms, tr 1 µs (memory); applied with the supply disconnected (memory)",
  },
  {
    id: "iso7637-2-pulse-1-24v",
    title: "ISO 7637-2 pulse 1, 24 V system, −600 V",
    baseV: 0,
    amplitudeV: -600,
    sourceResistanceOhm: 50,
    riseS: 3e-6,
    decayS: 1e-3,
    decayConvention: "to-10-percent",
    source: "ISO 7637-2 pulse 1, 24 V: up to −600 V, Ri 50 Ω, td 1 ms, tr 3 µs (docs/references.md [S]); base 0 V (memory)",
  },
  {
    id: "iso7637-2-pulse-2a",
    title: "ISO 7637-2 pulse 2a (series inductance interrupted), +112 V on the supply",
    baseV: "supply",
    amplitudeV: 112,
    sourceResistanceOhm: 2,
    riseS: 1e-6,
    decayS: 50e-6,
    decayConvention: "to-10-percent",
    source: "ISO 7637-2 pulse 2a: +37 to +112 V, Ri 2 Ω, td 50 µs, tr 1 µs (docs/references.md [S]); riding on the nominal supply (memory)",
  },
  {
    id: "iso7637-2-pulse-3a",
    title: "ISO 7637-2 pulse 3a (switching spikes), −220 V",
    baseV: "supply",
    amplitudeV: -220,
    sourceResistanceOhm: 50,
    riseS: 5e-9,
    decayS: 0.1e-6,
    decayConvention: "to-10-percent",
    source: "ISO 7637-2 pulses 3a/3b: ±(75–220) V class levels, Ri 50 Ω, td 0.1 µs, tr 5 ns (docs/references.md [S/M])",
  },
  {
    id: "iso16750-2-load-dump-a-12v",
    title: "ISO 16750-2 load dump test A (unsuppressed), 12 V: 101 V peak, Ri 4 Ω, td 400 ms",
    baseV: 13.5,
    amplitudeV: 101 - 13.5,
    sourceResistanceOhm: 4,
    riseS: 10e-3,
    decayS: 400e-3,
    decayConvention: "to-10-percent",
    source: "ISO 16750-2 test A, 12 V: Us 79–101 V, Ri 0.5–4 Ω, td 40–400 ms, tr 10 ms, higher Us with higher Ri (docs/references.md [S]); the severe corner chosen and Us read as the peak including the 13.5 V supply (memory)",
  },
  {
    id: "iso16750-2-load-dump-a-24v",
    title: "ISO 16750-2 load dump test A (unsuppressed), 24 V: 202 V peak, Ri 8 Ω, td 350 ms",
    baseV: 27,
    amplitudeV: 202 - 27,
    sourceResistanceOhm: 8,
    riseS: 10e-3,
    decayS: 350e-3,
    decayConvention: "to-10-percent",
    source: "ISO 16750-2 test A, 24 V: Us 151–202 V, Ri 1–8 Ω, td 100–350 ms (docs/references.md [S]); corner and peak reading as for 12 V (memory)",
  },
  {
    id: "iso16750-2-load-dump-b-12v",
    title: "ISO 16750-2 load dump test B (centrally suppressed), 12 V: clamped to 35 V",
    baseV: 13.5,
    amplitudeV: 101 - 13.5,
    sourceResistanceOhm: 4,
    riseS: 10e-3,
    decayS: 400e-3,
    decayConvention: "to-10-percent",
    clampedAtV: 35,
    source: "ISO 16750-2 test B, 12 V: clamped to 35 V (docs/references.md [S])",
  },
  {
    id: "iso16750-2-load-dump-b-24v",
    title: "ISO 16750-2 load dump test B (centrally suppressed), 24 V: clamped to about 58 V",
    baseV: 27,
    amplitudeV: 202 - 27,
    sourceResistanceOhm: 8,
    riseS: 10e-3,
    decayS: 350e-3,
    decayConvention: "to-10-percent",
    clampedAtV: 58,
    source: "ISO 16750-2 test B, 24 V: clamped to about 58 V (docs/references.md [S])",
  },
];

export function findTransient(id: string): TransientPulse | undefined {
  return TRANSIENT_LIBRARY.find((t) => t.id === id);
}
