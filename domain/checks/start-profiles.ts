/**
 * Built-in starting (cold-crank) profiles after ISO 16750-2 clause 4.6.3: from the battery voltage
 * UB the supply falls in tf to US (the cranking dip), holds it for t6, rises in t7 to UA, holds UA
 * for t8 and returns to UB in tr. The 12 V level I dip to 8 V is [S] (docs/references.md); every
 * other figure (the deeper levels, UA, the times, UB and all 24 V levels) is memory, to be
 * confirmed against the standard's table. A caller who has the table gives the points instead.
 */
export interface StartProfileDef {
  readonly id: string;
  readonly title: string;
  /** Battery voltage before and after the crank, V. */
  readonly batteryV: number;
  /** The cranking dip US, V, held for t6. */
  readonly dipV: number;
  /** The level UA the supply recovers to while cranking, V, held for t8. */
  readonly crankV: number;
  readonly fallS: number;
  readonly dipS: number;
  readonly riseS: number;
  readonly crankS: number;
  readonly returnS: number;
  readonly source: string;
}

const times12 = { fallS: 5e-3, dipS: 15e-3, riseS: 50e-3, crankS: 1, returnS: 100e-3 } as const;
const times24 = { fallS: 10e-3, dipS: 50e-3, riseS: 50e-3, crankS: 1, returnS: 100e-3 } as const;
const src = (level: string, system: string, confirmed: boolean) =>
  `ISO 16750-2 clause 4.6.3 starting profile, ${system} level ${level}: ${confirmed ? "the 8 V dip [S, docs/references.md]; UA, times and UB" : "dip, UA, times and UB"} (memory)`;

export const START_PROFILES: readonly StartProfileDef[] = [
  {
    id: "iso16750-2-12v-level-1",
    title: "12 V starting profile level I: 8 V dip, 9.5 V cranking",
    batteryV: 12,
    dipV: 8,
    crankV: 9.5,
    ...times12,
    source: src("I", "12 V", true),
  },
  {
    id: "iso16750-2-12v-level-2",
    title: "12 V starting profile level II: 4.5 V dip, 6.5 V cranking",
    batteryV: 12,
    dipV: 4.5,
    crankV: 6.5,
    ...times12,
    source: src("II", "12 V", false),
  },
  {
    id: "iso16750-2-12v-level-3",
    title: "12 V starting profile level III: 3 V dip, 5 V cranking",
    batteryV: 12,
    dipV: 3,
    crankV: 5,
    ...times12,
    source: src("III", "12 V", false),
  },
  {
    id: "iso16750-2-12v-level-4",
    title: "12 V starting profile level IV: 6 V dip, 6.5 V cranking",
    batteryV: 12,
    dipV: 6,
    crankV: 6.5,
    ...times12,
    source: src("IV", "12 V", false),
  },
  {
    id: "iso16750-2-24v-level-1",
    title: "24 V starting profile level I: 10 V dip, 15 V cranking",
    batteryV: 24,
    dipV: 10,
    crankV: 15,
    ...times24,
    source: src("I", "24 V", false),
  },
  {
    id: "iso16750-2-24v-level-2",
    title: "24 V starting profile level II: 8 V dip, 15 V cranking",
    batteryV: 24,
    dipV: 8,
    crankV: 15,
    ...times24,
    source: src("II", "24 V", false),
  },
  {
    id: "iso16750-2-24v-level-3",
    title: "24 V starting profile level III: 6 V dip, 10 V cranking",
    batteryV: 24,
    dipV: 6,
    crankV: 10,
    ...times24,
    source: src("III", "24 V", false),
  },
];

export const START_PROFILE_IDS = START_PROFILES.map((p) => p.id) as [string, ...string[]];

/** Points of one crank of a built-in profile (6 points, starting at t = 0). */
export const START_PROFILE_POINTS = 6;

export interface ProfilePoint {
  readonly timeS: number;
  readonly voltageV: number;
}

function onePass(p: StartProfileDef): ProfilePoint[] {
  const t1 = p.fallS;
  const t2 = t1 + p.dipS;
  const t3 = t2 + p.riseS;
  const t4 = t3 + p.crankS;
  const t5 = t4 + p.returnS;
  return [
    { timeS: 0, voltageV: p.batteryV },
    { timeS: t1, voltageV: p.dipV },
    { timeS: t2, voltageV: p.dipV },
    { timeS: t3, voltageV: p.crankV },
    { timeS: t4, voltageV: p.crankV },
    { timeS: t5, voltageV: p.batteryV },
  ];
}

/**
 * A profile repeated `cranks` times, each next crank starting `restS` after the previous one
 * ended at the battery voltage (restS 0: at once, the shared point written once). Points:
 * cranks·6 with a rest, cranks·5 + 1 without.
 */
export function repeatedProfile(points: readonly ProfilePoint[], cranks: number, restS: number): ProfilePoint[] {
  const first = points[0];
  const last = points[points.length - 1];
  if (first === undefined || last === undefined) return [];
  const period = last.timeS - first.timeS + restS;
  const out: ProfilePoint[] = [];
  for (let k = 0; k < cranks; k += 1) {
    points.forEach((p, i) => {
      if (k > 0 && i === 0 && restS === 0) return;
      out.push({ timeS: p.timeS + k * period, voltageV: p.voltageV });
    });
  }
  return out;
}

export function profilePointCount(pointsPerCrank: number, cranks: number, restS: number): number {
  return restS > 0 ? pointsPerCrank * cranks : (pointsPerCrank - 1) * cranks + 1;
}

export function builtInProfile(id: string): { def: StartProfileDef; points: ProfilePoint[] } | undefined {
  const def = START_PROFILES.find((p) => p.id === id);
  return def === undefined ? undefined : { def, points: onePass(def) };
}
