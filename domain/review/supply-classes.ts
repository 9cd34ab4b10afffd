/**
 * Built-in supply classes. Each value says where it comes from: a standard's clause ("S"), or
 * "memory" where it was written from general knowledge and must be confirmed before it is relied
 * on (docs/references.md). Every value can be overridden in the requirement.
 */
export interface SupplyClass {
  readonly id: string;
  readonly title: string;
  readonly minV: number;
  readonly nominalV: number;
  readonly maxV: number;
  /** Steady reverse polarity to withstand (magnitude), V, and for how long, s. */
  readonly reverseV: number;
  readonly reverseDurationS: number;
  /** Jump-start overvoltage (a steady overvoltage for about a minute), V; absent where the class has none. */
  readonly jumpStartV?: number;
  /** Long-term overvoltage (a failed generator regulator, about an hour), V; absent where the class has none. */
  readonly longTermOvervoltageV?: number;
  /** Top of the abnormal service range the equipment must survive without damage, V (magnitude). */
  readonly abnormalMaxV?: number;
  /** Transients of the built-in library that apply to this class by default. */
  readonly transients: readonly string[];
  readonly source: string;
}

const iso = "ISO 16750-2, supply voltage codes (docs/references.md [S])";
const isoRev12 = "reversed voltage −14 V for 60 s, ISO 16750-2 clause 4.7 (memory)";
const isoRev24 = "reversed voltage −28 V for 60 s, ISO 16750-2 clause 4.7 (memory)";
const nominal12 = "nominal 13.5 V, ISO 7637-2's test supply voltage (docs/references.md [S, secondary])";
const nominal24 = "nominal 27 V, ISO 7637-2's test supply voltage (docs/references.md [S, secondary])";
const jump12 = "jump start 24 V for 60 s, ISO 16750-2 clause 4.3.1.2 (docs/references.md [S, secondary])";
const jump24 =
  "jump start 36 V for 60 s (memory: the secondary sources give the jump-start test for 12 V systems only; 36 V is clause 4.3's overvoltage for 24 V systems, docs/references.md [S, secondary])";
const longTerm12 = "long-term overvoltage 18 V for 60 min, ISO 16750-2 clause 4.3.1.1 (memory)";
const longTerm24 =
  "long-term overvoltage 36 V, ISO 16750-2 clause 4.3's level for 24 V systems (docs/references.md [S, secondary]), for 60 min (memory)";

/** IEC 61000-4-5 on a DC power port: surges of both polarities (a negative one reverse-biases a series blocking element). */
const surgeBothPolarities = ["iec61000-4-5-surge-1kv-line-line", "iec61000-4-5-surge-1kv-line-line-negative"];
const surgeSource =
  "surge IEC 61000-4-5 ±1 kV line to line: a DC power port takes five positive and five negative surges (clause 8.2 of the 2nd edition) and 1 kV is one of its test levels (docs/references.md [S, secondary]); 1 kV for a DC power port (memory: the product standard sets the level)";

const vehicle12 = (code: string, minV: number): SupplyClass => ({
  id: `vehicle-12v-${code.toLowerCase()}`,
  title: `12 V vehicle system, supply code ${code} (${minV}–16 V)`,
  minV,
  nominalV: 13.5,
  maxV: 16,
  reverseV: 14,
  reverseDurationS: 60,
  jumpStartV: 24,
  longTermOvervoltageV: 18,
  transients: ["iso7637-2-pulse-1-12v", "iso7637-2-pulse-2a", "iso16750-2-load-dump-b-12v"],
  source: `${iso}; ${nominal12}; ${isoRev12}; ${jump12}; ${longTerm12}`,
});
const vehicle24 = (code: string, minV: number): SupplyClass => ({
  id: `vehicle-24v-${code.toLowerCase()}`,
  title: `24 V vehicle system, supply code ${code} (${minV}–32 V)`,
  minV,
  nominalV: 27,
  maxV: 32,
  reverseV: 28,
  reverseDurationS: 60,
  jumpStartV: 36,
  longTermOvervoltageV: 36,
  transients: ["iso7637-2-pulse-1-24v", "iso7637-2-pulse-2a", "iso16750-2-load-dump-b-24v"],
  source: `${iso}; ${nominal24}; ${isoRev24}; ${jump24}; ${longTerm24}`,
});

export const SUPPLY_CLASSES: readonly SupplyClass[] = [
  vehicle12("A", 6),
  vehicle12("B", 8),
  vehicle12("C", 9),
  vehicle12("D", 10.5),
  vehicle24("E", 10),
  vehicle24("F", 16),
  vehicle24("G", 22),
  vehicle24("H", 18),
  {
    id: "industrial-24v",
    title: "24 V DC industrial control supply (20.4–28.8 V)",
    minV: 20.4,
    nominalV: 24,
    maxV: 28.8,
    reverseV: 28.8,
    reverseDurationS: 3600,
    transients: surgeBothPolarities,
    source: `IEC 61131-2 24 V DC steady range −15 %/+20 % of 24 V = 20.4–28.8 V (docs/references.md [S, secondary, through an equipment manual's table]); reverse: the full maximum reversed by miswiring (common practice); ${surgeSource}`,
  },
  {
    id: "telecom-48v",
    title: "−48 V telecom feed, normal service 40.5–57 V (magnitude)",
    minV: 40.5,
    nominalV: 54,
    maxV: 57,
    reverseV: 60,
    reverseDurationS: 3600,
    abnormalMaxV: 60,
    transients: surgeBothPolarities,
    source: `ETSI EN 300 132-2 normal service range −40.5 to −57.0 V (memory: docs/references.md); abnormal to −60 V (memory); nominal −54 V float (memory); reverse: feed wires swapped at the abnormal limit (common practice); ${surgeSource}`,
  },
  ...[
    ["poe-pd-type-1", "Type 1", 37, 12.95],
    ["poe-pd-type-2", "Type 2", 42.5, 25.5],
    ["poe-pd-type-3", "Type 3", 42.5, 51],
    ["poe-pd-type-4", "Type 4", 41.1, 71.3],
  ].map(
    ([id, type, minV, powerW]): SupplyClass => ({
      id: String(id),
      title: `PoE powered device ${type}: ${minV}–57 V at the PD input, ${powerW} W`,
      minV: Number(minV),
      nominalV: 50,
      maxV: 57,
      reverseV: 57,
      reverseDurationS: 3600,
      transients: [],
      source:
        "IEEE 802.3 PD input ranges (memory: docs/references.md says what would confirm them); nominal 50 V (memory); the PD must accept either polarity (clause 33.3.1), so reverse = the full range reversed",
    }),
  ),
];

export function findSupplyClass(id: string): SupplyClass | undefined {
  return SUPPLY_CLASSES.find((c) => c.id === id);
}
