// Known-bad designs: each is one a practitioner rejects for one named reason, beside a near twin
// that differs in the one thing that fixes it. Parts are invented (no manufacturer's data); the
// physics each design leans on is named beside it (common practice, closed forms of the models).

export type Hazard =
  | "thermal"
  | "reverse"
  | "transient"
  | "clamp"
  | "controller"
  | "turn-off"
  | "hold-up"
  | "start-up"
  | "bridge"
  | "load"
  | "standby";

export interface KnownBad {
  readonly id: string;
  readonly hazard: Hazard;
  /** What a practitioner sees. */
  readonly why: string;
  readonly procedure: "review" | "holdUp" | "turnOff" | "bridgeAc";
  /** The rule that must fail on `bad` and pass on `twin`. */
  readonly rule: string;
  /** Built-in sets where the hazard is a failure (default: all three). */
  readonly sets?: readonly string[];
  readonly bad: Record<string, unknown>;
  readonly twin: Record<string, unknown>;
}

type Obj = Record<string, unknown>;

const schottky = (o: Obj = {}): Obj => ({
  kind: "schottky-diode",
  name: "test Schottky",
  diode: { model: "shockley", saturationCurrentA: "40 uA", ideality: 1.15, seriesResistanceOhm: "18 mOhm" },
  reverseRatingV: 60,
  tjMaxC: 175,
  thermal: { kind: "junction-ambient", rthJaKPerW: 35 },
  ...o,
});
const pn = (o: Obj = {}): Obj => ({
  kind: "pn-diode",
  name: "test PN rectifier",
  diode: { model: "shockley", saturationCurrentA: "20 nA", ideality: 1.9, seriesResistanceOhm: "30 mOhm" },
  reverseRatingV: 100,
  tjMaxC: 150,
  thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
  ...o,
});
const mosfet = (o: Obj = {}): Obj => ({
  rdsOn: [
    { gateSourceV: 4.5, rdsOnOhm: "4.5 mOhm" },
    { gateSourceV: 10, rdsOnOhm: "3 mOhm" },
  ],
  thresholdV: 2,
  vgsMaxV: 20,
  vdsMaxV: 60,
  tjMaxC: 175,
  bodyDiode: { model: "shockley", saturationCurrentA: "8 nA", ideality: 1.4, seriesResistanceOhm: "10 mOhm" },
  avalancheEnergyJ: "150 mJ",
  avalancheCurrentA: "60 A",
  ...o,
});
const controller = (o: Obj = {}): Obj => ({
  startV: 3.2,
  gateDrive: [
    { inputV: 3.2, gateSourceV: 6 },
    { inputV: 6, gateSourceV: 10 },
    { inputV: 12, gateSourceV: 11 },
  ],
  regulatedDropV: "20 mV",
  quiescentA: "80 uA",
  maxInputV: 65,
  reverseThresholdV: "30 mV",
  turnOffDelayS: "2 us",
  reverseRatingV: 65,
  ...o,
});
export const idealDiode = (m: Obj = {}, c: Obj = {}): Obj => ({
  kind: "nfet-ideal-diode",
  name: "test ideal diode",
  mosfet: mosfet(m),
  controller: controller(c),
  thermal: { kind: "junction-ambient", rthJaKPerW: 45 },
});
const backToBack = (m: Obj = {}): Obj => ({
  kind: "nfet-back-to-back",
  name: "test back-to-back pair",
  mosfet: mosfet(m),
  controller: controller(),
  thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
});
const pfet = (m: Obj = {}, o: Obj = {}): Obj => ({
  kind: "pfet-high-side",
  name: "test P-FET",
  mosfet: mosfet({
    rdsOn: [
      { gateSourceV: 4.5, rdsOnOhm: "19 mOhm" },
      { gateSourceV: 10, rdsOnOhm: "12 mOhm" },
    ],
    vdsMaxV: 60,
    ...m,
  }),
  gateClampV: 15,
  thermal: { kind: "junction-ambient", rthJaKPerW: 50 },
  ...o,
});
const integratedSwitch = (o: Obj = {}): Obj => ({
  kind: "integrated-switch",
  name: "test integrated switch",
  onResistanceOhm: "25 mOhm",
  startV: 2.5,
  belowStart: "blocks",
  regulatedDropV: "15 mV",
  quiescentA: "0.2 mA",
  maxVoltageV: 60,
  currentLimitA: 6,
  tjMaxC: 150,
  thermal: { kind: "junction-ambient", rthJaKPerW: 55 },
  reverseRatingV: 60,
  ...o,
});

/** A clamp's junction-to-ambient Foster network (invented): a fast die, a package, and its mounting's slow tail. */
const clampNetwork = (mountingKPerW: number): Obj[] => [
  { rKPerW: 0.05, tauS: 1e-3 },
  { rKPerW: 0.5, tauS: 0.05 },
  { rKPerW: mountingKPerW, tauS: 60 },
];
/** A load-dump suppressor's Foster network (invented): a large die on a heavy mounting. */
const loadDumpClampNetwork: Obj[] = [
  { rKPerW: 0.01, tauS: 0.01 },
  { rKPerW: 0.05, tauS: 1 },
  { rKPerW: 1, tauS: 100 },
];
const req12: Obj = {
  supply: { class: "vehicle-12v-b" },
  load: { kind: "constant-current", currentA: 3 },
  ambient: { minC: -40, maxC: 85 },
  transients: [],
};
const req24: Obj = {
  supply: { class: "vehicle-24v-f" },
  load: { kind: "constant-current", currentA: 3 },
  ambient: { minC: -40, maxC: 85 },
  transients: [],
};
const req48: Obj = {
  supply: { class: "telecom-48v" },
  load: { kind: "constant-current", currentA: 3 },
  ambient: { minC: -5, maxC: 55 },
  transients: [],
};
/** The industrial 24 V class with its default transients (IEC 61000-4-5 ±1 kV line to line). */
const req24Industrial: Obj = {
  supply: { class: "industrial-24v" },
  load: { kind: "constant-current", currentA: 2 },
  ambient: { minC: -25, maxC: 60 },
  inputClamp: { standoffV: 30, clampV: 48, peakCurrentA: 1000, energyJ: 100, thermal: clampNetwork(20) },
};
/** A MOSFET rated at 4.5 V of gate drive only (the controller's ~7 V pump drives it fully on a 5 V rail). */
const logicLevel: Obj = { rdsOn: [{ gateSourceV: 4.5, rdsOnOhm: "4.5 mOhm" }] };
/** A 5 V rail into 1 Ω behind a source resistance, for the start threshold's chatter band. */
const chatterReq = (sourceResistanceOhm: number): Obj => ({
  supply: { class: "custom", minV: 4.05, nominalV: 5, maxV: 5.5 },
  sourceResistanceOhm,
  load: { kind: "resistive", resistanceOhm: 1 },
  ambient: { minC: 0, maxC: 50 },
  reverse: { voltageV: 5.5, durationS: 60 },
  transients: [],
});
const review = (requirement: Obj, stage: Obj): Obj => ({ requirement, candidates: [{ stage }] });
/** A 3.3 V rail (2.7–3.6 V) at −40 °C through a logic-level P-FET whose Vth falls 6 mV/K, with its datasheet-maximum Vth. */
const coldRail = (thresholdMaxV: number): Obj => ({
  requirement: {
    supply: { class: "custom", minV: 2.7, nominalV: 3.3, maxV: 3.6 },
    load: { kind: "constant-current", currentA: 1 },
    ambient: { minC: -40, maxC: 85 },
    reverse: { voltageV: 3.6, durationS: 60 },
    transients: [],
  },
  candidates: [
    {
      stage: pfet(
        { rdsOn: [{ gateSourceV: 2.5, rdsOnOhm: "40 mOhm" }], thresholdV: 1.5, thresholdTempCoVPerK: -0.006 },
        { gateClampV: undefined },
      ),
      datasheetMax: { rdsOnFactor: 1.3, forwardVoltageFactor: 1.1, thresholdV: thresholdMaxV },
    },
  ],
});
/** Invented Foster networks (Zth) summing to the stage's steady path: 45 K/W (the FET), 55 K/W (the switch). */
const fetZth: Obj = {
  kind: "foster",
  terms: [
    { rKPerW: 0.5, tauS: 1e-3 },
    { rKPerW: 4, tauS: 0.05 },
    { rKPerW: 40.5, tauS: 10 },
  ],
};
/** The pair's: summing to its 40 K/W path, taken as the input-side FET's own network during the inrush. */
const pairZth: Obj = {
  kind: "foster",
  terms: [
    { rKPerW: 0.5, tauS: 1e-3 },
    { rKPerW: 4, tauS: 0.05 },
    { rKPerW: 35.5, tauS: 10 },
  ],
};
const switchZth: Obj = {
  kind: "foster",
  terms: [
    { rKPerW: 0.8, tauS: 1e-3 },
    { rKPerW: 6, tauS: 0.05 },
    { rKPerW: 48.2, tauS: 10 },
  ],
};
/** Invented single-pulse SOA lines of the test FET (25 °C case), straight on log-log axes. */
const soaLines: Obj[] = [
  {
    pulseWidthS: 1e-3,
    points: [
      { vdsV: 1, idA: 200 },
      { vdsV: 60, idA: 2 },
    ],
  },
  {
    pulseWidthS: 10e-3,
    points: [
      { vdsV: 1, idA: 100 },
      { vdsV: 60, idA: 0.6 },
    ],
  },
  {
    pulseWidthS: 0.1,
    points: [
      { vdsV: 1, idA: 60 },
      { vdsV: 60, idA: 0.2 },
    ],
  },
];
/** A start-up profile from 11 V stepping to 18 V for holdS and back. */
const holdAt18V = (holdS: number): Obj[] => [
  { timeS: 0, voltageV: 11 },
  { timeS: 0.001, voltageV: 18 },
  { timeS: 0.001 + holdS, voltageV: 18 },
  { timeS: 0.002 + holdS, voltageV: 11 },
  { timeS: 1 + holdS, voltageV: 11 },
];
const reviewZth = (requirement: Obj, stage: Obj, transientThermal: Obj): Obj => ({
  requirement,
  candidates: [{ stage, transientThermal }],
});
/**
 * A bidirectional TVS-like input clamp: stand-off above jump start, clamping below the parts' ratings,
 * with its Foster network on a 20 K/W mounting (invented): its junction over each pulse train is assessed.
 */
const clamp = (o: Obj = {}): Obj => ({
  standoffV: 26,
  clampV: 40,
  peakCurrentA: 100,
  energyJ: 100,
  thermal: clampNetwork(20),
  ...o,
});
/** The 10 uH cut of the ideal diode repeated every periodS, on a candidate with a junction-ambient Foster network. */
const trainReview = (periodS: number): Obj => ({
  requirement: {
    ...req12,
    turnOff: {
      ...turnOffEvent,
      loop: { resistanceOhm: "20 mOhm", inductanceH: "10 uH" },
      repetition: { periodS, count: 10_000_000 },
    },
  },
  candidates: [
    {
      stage: idealDiode({ avalancheEnergyJ: "150 mJ" }),
      transientThermal: {
        kind: "foster",
        terms: [
          { rKPerW: 5, tauS: 0.01 },
          { rKPerW: 40, tauS: 20 },
        ],
      },
    },
  ],
});
/** A P-FET's output at a −14 V input, its gate to ground through the given resistor (30 nC at 10 V). */
const pfetNegativeInput = (gateResistor: string): Obj => ({
  stage: pfet({ avalancheCurrentA: "400 A" }),
  outputV: "12 V",
  inputAfterV: "-14 V",
  gateLag: { resistanceOhm: gateResistor, gateChargeC: "30 nC", atGateSourceV: "10 V" },
  loop: { resistanceOhm: "40 mOhm", inductanceH: "1 uH" },
  capacitor: { capacitanceF: "1000 uF", esrOhm: "10 mOhm" },
  load: { kind: "constant-current", currentA: 1 },
  loadMinV: "8 V",
  tjC: "25 degC",
  loadReverseLimitV: "0.5 V",
});
/**
 * Pulse 1 (−150 V, Ri 10 ohm, clamped at 36 V) at a supply-gated FET (a P-FET's gate to ground, a
 * low-side N-FET's from the positive rail) through the given resistor (30 nC at 10 V); the
 * requirement's turn-off event is damped (1 ohm of loop: no undershoot) into a resistive load (which
 * cannot drive its input below 0 V), so only the pulse pulls the output below 0 V.
 */
const fetUnderPulse1 = (fet: (m: Obj) => Obj, gateResistor: string, part: Obj = {}): Obj =>
  review(
    {
      ...req12,
      load: { kind: "resistive", resistanceOhm: "10 ohm" },
      transients: ["iso7637-2-pulse-1-12v"],
      inputClamp: clamp({ clampV: 36 }),
      turnOff: {
        loop: { resistanceOhm: "1 ohm", inductanceH: "1 uH" },
        capacitor: { capacitanceF: "47 uF", esrOhm: "20 mOhm" },
        gateLag: { resistanceOhm: gateResistor, gateChargeC: "30 nC", atGateSourceV: "10 V" },
        loadReverseLimitV: "0.5 V",
      },
    },
    // Fully enhanced at 6 V: the vehicle class's 8 V minimum supply drives it fully on.
    fet({
      avalancheCurrentA: "400 A",
      avalancheEnergyJ: "1 J",
      rdsOn: [
        { gateSourceV: 4.5, rdsOnOhm: "19 mOhm" },
        { gateSourceV: 6, rdsOnOhm: "12 mOhm" },
      ],
      ...part,
    }),
  );
const pfetUnderPulse1 = (gateResistor: string): Obj => fetUnderPulse1(pfet, gateResistor);
/**
 * The same pulse at a low-side N-FET (drain to the battery's − terminal, source to the module's
 * ground, gate fed from the positive rail through the given resistor): the same part and loop.
 */
const lowSideUnderPulse1 = (gateResistor: string): Obj =>
  fetUnderPulse1((m) => ({ ...pfet(m), kind: "nfet-low-side", name: "test low-side N-FET" }), gateResistor);
/**
 * The negative 1 kV line-to-line surge of the industrial 24 V class (2 ohm, clamped at 48 V) riding
 * on a 24 V supply fed over a long field cable (2 ohm: the battery side is no longer stiff) at a
 * P-FET whose gate goes to ground through the given resistor (30 nC at 10 V), a 10 uF output; the
 * requirement's turn-off event is damped (1 ohm of loop) into a resistive load.
 */
const pfetUnderSupplySurge = (gateResistor: string | undefined): Obj =>
  review(
    {
      supply: { class: "industrial-24v" },
      sourceResistanceOhm: "2 ohm",
      load: { kind: "resistive", resistanceOhm: "10 ohm" },
      ambient: { minC: -25, maxC: 60 },
      inputClamp: { standoffV: 30, clampV: 48, peakCurrentA: 1000, energyJ: 100, thermal: clampNetwork(20) },
      turnOff: {
        loop: { resistanceOhm: "1 ohm", inductanceH: "1 uH" },
        capacitor: { capacitanceF: "10 uF", esrOhm: "20 mOhm" },
        gateLag: { resistanceOhm: gateResistor ?? "100 Ohm", gateChargeC: "30 nC", atGateSourceV: "10 V" },
        loadReverseLimitV: "0.5 V",
      },
    },
    gateResistor === undefined
      ? idealDiode({ avalancheCurrentA: "400 A", avalancheEnergyJ: "1 J", vdsMaxV: 100 })
      : pfet({
          avalancheCurrentA: "400 A",
          avalancheEnergyJ: "1 J",
          rdsOn: [
            { gateSourceV: 4.5, rdsOnOhm: "19 mOhm" },
            { gateSourceV: 6, rdsOnOhm: "12 mOhm" },
          ],
        }),
  );
/**
 * ISO 7637-2 pulse 1 (12 V, −150 V behind 10 ohm, supply disconnected) at a P-FET behind a TVS that
 * breaks down at 28.9 V (40 V at 60 A, invented), into 470 uF; the gate goes to ground through the
 * given resistor (100 nC at 10 V); the load tolerates 7 V of reverse voltage.
 */
export const pfetPulse1HeldByClamp = (gateResistor: string): Obj =>
  review(
    {
      ...req12,
      transients: ["iso7637-2-pulse-1-12v"],
      inputClamp: clamp({ breakdownV: 28.9, clampV: 40, peakCurrentA: 60 }),
      turnOff: {
        loop: { resistanceOhm: "20 mOhm", inductanceH: "1 uH" },
        capacitor: { capacitanceF: "470 uF", esrOhm: "20 mOhm" },
        gateLag: { resistanceOhm: gateResistor, gateChargeC: "100 nC", atGateSourceV: "10 V" },
        loadReverseLimitV: "7 V",
      },
    },
    pfet({
      avalancheCurrentA: "400 A",
      avalancheEnergyJ: "1 J",
      rdsOn: [
        { gateSourceV: 4.5, rdsOnOhm: "19 mOhm" },
        { gateSourceV: 6, rdsOnOhm: "12 mOhm" },
      ],
    }),
  );
const crank: Obj[] = [
  { timeS: 0, voltageV: 12 },
  { timeS: 0.005, voltageV: 4.5 },
  { timeS: 0.02, voltageV: 4.5 },
  { timeS: 0.07, voltageV: 6.5 },
  { timeS: 1, voltageV: 6.5 },
  { timeS: 1.1, voltageV: 12 },
];
const turnOffEvent: Obj = {
  loop: { resistanceOhm: "20 mOhm", inductanceH: "1 uH" },
  capacitor: { capacitanceF: "470 uF", esrOhm: "20 mOhm" },
};
const holdUp = (requiredHoldUpS: string): Obj => ({
  stages: [idealDiode()],
  outputV: "12 V",
  capacitor: { capacitanceF: "1000 uF", esrOhm: "30 mOhm" },
  load: { kind: "constant-power", powerW: 20, minVoltageV: "8 V" },
  tjC: "85 degC",
  requiredHoldUpS,
  input: { kind: "open" },
});
const bridgeAc = (ifrm: string): Obj => ({
  bridge: { all: pn({ peakRepetitiveCurrentA: ifrm, thermal: { kind: "junction-ambient", rthJaKPerW: 30 } }) },
  sourceRmsV: "24 V",
  frequencyHz: "50 Hz",
  sourceResistanceOhm: "0.4 ohm",
  leakageInductanceH: "1 mH",
  capacitanceF: "2200 uF",
  esrOhm: "40 mOhm",
  capacitorRippleRatingA: "5 A",
  load: { kind: "resistive", resistanceOhm: "40 ohm" },
  ambientC: "40 degC",
});

export const KNOWN_BAD: readonly KnownBad[] = [
  {
    id: "schottky-hot-at-full-load",
    hazard: "thermal",
    why: "a 10 A Schottky at 8 A on 60 K/W at 85 °C: about 4 W, Tj far above 175 °C",
    procedure: "review",
    rule: "tj-limit",
    bad: review(
      { ...req12, load: { kind: "constant-current", currentA: 8 } },
      schottky({ thermal: { kind: "junction-ambient", rthJaKPerW: 60 } }),
    ),
    twin: review(
      { ...req12, load: { kind: "constant-current", currentA: 1 } },
      schottky({ thermal: { kind: "junction-ambient", rthJaKPerW: 60 } }),
    ),
  },
  {
    id: "pn-diode-loses-the-load",
    hazard: "load",
    why: "a PN diode drops about 1 V: at the 8 V bottom of the supply the 7.5 V load is lost",
    procedure: "review",
    rule: "load-voltage-min",
    bad: review({ ...req12, load: { kind: "constant-current", currentA: 0.8 }, loadMinV: 7.5 }, pn()),
    twin: review({ ...req12, load: { kind: "constant-current", currentA: 0.8 }, loadMinV: 5 }, pn()),
  },
  {
    id: "schottky-reverse-runaway",
    hazard: "reverse",
    why: "a 60 V Schottky on 60 K/W at 125 °C under the 28 V reversed 24 V battery: leakage runs away",
    procedure: "review",
    rule: "reverse-leakage-runaway",
    bad: review(
      { ...req24, load: { kind: "constant-current", currentA: 0.2 }, ambient: { minC: -40, maxC: 125 } },
      schottky({ thermal: { kind: "junction-ambient", rthJaKPerW: 60 } }),
    ),
    twin: review(
      { ...req24, load: { kind: "constant-current", currentA: 0.2 }, ambient: { minC: -40, maxC: 125 } },
      pn({ reverseRatingV: 100, thermal: { kind: "junction-ambient", rthJaKPerW: 60 } }),
    ),
  },
  {
    id: "schottky-hot-leakage-runaway",
    hazard: "reverse",
    why: "a 40 µA-at-25 °C Schottky (barrier 0.7 eV) on 35 K/W at 100 °C under the 14 V reversed battery: thermionic emission gives about ×370 to 100 °C, 15 mA, 0.2 W, 7 K — above the 1/(e·d ln IR/dT) ≈ 5 K a stable point allows; the forward fit's Is(T) gave ×160 and passed it",
    procedure: "review",
    rule: "reverse-leakage-runaway",
    bad: review(
      { ...req12, load: { kind: "constant-current", currentA: 0.2 }, ambient: { minC: -40, maxC: 100 } },
      schottky({ reverseLeakage: { currentA: "40 uA", tempC: 25, barrierEv: 0.7 } }),
    ),
    twin: review(
      { ...req12, load: { kind: "constant-current", currentA: 0.2 }, ambient: { minC: -40, maxC: 100 } },
      schottky({
        reverseLeakage: { currentA: "40 uA", tempC: 25, barrierEv: 0.7 },
        thermal: { kind: "junction-ambient", rthJaKPerW: 12 },
      }),
    ),
  },
  {
    id: "schottky-reverse-too-hot",
    hazard: "reverse",
    why: "a leaky rectifier at 165 °C ambient settles under the reversed battery, but its own leakage holds it above Tj(max) (a stable point lies at most about 1/(d ln IR/dT) ≈ 10-15 K above ambient)",
    procedure: "review",
    rule: "reverse-tj-limit",
    sets: ["default", "consumer"],
    bad: review(
      { ...req12, load: { kind: "constant-current", currentA: 0.1 }, ambient: { minC: -40, maxC: 165 } },
      pn({
        tjMaxC: 175,
        diode: { model: "shockley", saturationCurrentA: "5 uA", ideality: 1.9, seriesResistanceOhm: "30 mOhm" },
      }),
    ),
    twin: review(
      { ...req12, load: { kind: "constant-current", currentA: 0.1 }, ambient: { minC: -40, maxC: 165 } },
      pn({ tjMaxC: 175 }),
    ),
  },
  {
    id: "rectifier-reverse-too-hot-vehicle",
    hazard: "reverse",
    why: "the same leaky rectifier at 155 °C ambient: its reverse junction settles about 13 K up (168 °C), inside Tj(max) but within the vehicle set's 10 K margin; the twin's stays at ambient",
    procedure: "review",
    rule: "reverse-tj-limit",
    sets: ["vehicle"],
    bad: review(
      { ...req12, load: { kind: "constant-current", currentA: 0.1 }, ambient: { minC: -40, maxC: 155 } },
      pn({
        tjMaxC: 175,
        diode: { model: "shockley", saturationCurrentA: "8 uA", ideality: 1.9, seriesResistanceOhm: "30 mOhm" },
      }),
    ),
    twin: review(
      { ...req12, load: { kind: "constant-current", currentA: 0.1 }, ambient: { minC: -40, maxC: 155 } },
      pn({ tjMaxC: 175 }),
    ),
  },
  {
    id: "schottky-30v-on-24v-reverse",
    hazard: "reverse",
    why: "a 30 V Schottky blocks the 28 V reversed 24 V battery at 93 % of VRRM",
    procedure: "review",
    rule: "diode-reverse-steady",
    bad: review(req24, schottky({ reverseRatingV: 30 })),
    twin: review(req24, schottky({ reverseRatingV: 60 })),
  },
  {
    id: "pfet-30v-on-24v-reverse",
    hazard: "reverse",
    why: "a 30 V P-FET's body diode blocks the 28 V reversed 24 V battery",
    procedure: "review",
    rule: "fet-vds-reverse-steady",
    bad: review(req24, pfet({ vdsMaxV: 30 })),
    twin: review(req24, pfet({ vdsMaxV: 60 })),
  },
  {
    id: "switch-20v-reverse-on-24v",
    hazard: "reverse",
    why: "an integrated switch rated 20 V reverse under the 28 V reversed 24 V battery",
    procedure: "review",
    rule: "switch-reverse-steady",
    bad: review(req24, integratedSwitch({ reverseRatingV: 20 })),
    twin: review(req24, integratedSwitch({ reverseRatingV: 60 })),
  },
  {
    id: "controller-pin-20v-reverse",
    hazard: "controller",
    why: "the ideal-diode controller's pin is rated 20 V reverse; the reversed 24 V battery puts 28 V on it",
    procedure: "review",
    rule: "controller-reverse-max",
    bad: review(req24, idealDiode({}, { reverseRatingV: 20 })),
    twin: review(req24, idealDiode({}, { reverseRatingV: 65 })),
  },
  {
    id: "controller-input-30v-on-24v",
    hazard: "controller",
    why: "a controller rated 30 V input on a 24 V system whose steady maximum is 32 V and jump start 36 V",
    procedure: "review",
    rule: "controller-input-max",
    bad: review(req24, idealDiode({}, { maxInputV: 30 })),
    twin: review(req24, idealDiode({}, { maxInputV: 65 })),
  },
  {
    // With both gates off (below start, or switched off) the input-side FET blocks the whole input.
    id: "back-to-back-30v-on-24v",
    hazard: "transient",
    why: "a back-to-back pair of 30 V FETs on a 24 V system whose steady maximum is 32 V and jump start 36 V: the input-side FET breaks down when the pair is off",
    procedure: "review",
    rule: "pair-forward-blocking",
    bad: review(req24, backToBack({ vdsMaxV: 30 })),
    twin: review(req24, backToBack({ vdsMaxV: 100 })),
  },
  {
    id: "pfet-gate-unclamped-on-24v",
    hazard: "transient",
    why: "a P-FET with its gate tied to ground and no Zener sees the full 32 V (36 V jump start) across a 20 V gate",
    procedure: "review",
    rule: "fet-vgs-limit",
    bad: review(req24, pfet({}, { gateClampV: undefined })),
    twin: review(req24, pfet({}, { gateClampV: 15 })),
  },
  {
    id: "schottky-45v-under-pulse-1",
    hazard: "transient",
    why: "pulse 1 (−150 V) clamped at 36 V while the output is held at 13.5 V puts 49.5 V across a 45 V Schottky",
    procedure: "review",
    rule: "diode-reverse-transient",
    bad: review(
      { ...req12, transients: ["iso7637-2-pulse-1-12v"], inputClamp: clamp({ clampV: 36 }) },
      schottky({ reverseRatingV: 45 }),
    ),
    twin: review(
      { ...req12, transients: ["iso7637-2-pulse-1-12v"], inputClamp: clamp({ clampV: 36 }) },
      schottky({ reverseRatingV: 60 }),
    ),
  },
  {
    // IEC 61000-4-5 tests a DC power port with both polarities: the negative surge reverse-biases
    // the series diode with the clamp's voltage plus the output its capacitance holds (closed form:
    // the blocking element sees |Vclamp| + Vheld, transient-stress.ts).
    id: "schottky-60v-under-negative-surge",
    hazard: "transient",
    why: "the −1 kV surge on an industrial 24 V input, clamped at 48 V, with the 24 V output held: 72 V across a 60 V Schottky",
    procedure: "review",
    rule: "diode-reverse-transient",
    bad: review(req24Industrial, schottky({ reverseRatingV: 60 })),
    twin: review(req24Industrial, schottky({ reverseRatingV: 100 })),
  },
  {
    // A 5 V rail (4.05 V at its lowest) behind 0.3 Ω into 1 Ω, controller start 3.2 V. Running, the
    // input is about 4.05/1.3 = 3.12 V, below start; on the body diode (~0.74 V) about
    // (4.05 + 0.3·0.74)/1.3 = 3.29 V, above it: neither state holds (closed form of the divider).
    // The twin's 50 mΩ source keeps the running input at about 4.05/1.05 = 3.86 V.
    id: "ideal-diode-chatters-at-start",
    hazard: "start-up",
    why: "a 3.2 V-start ideal diode on a 4.05 V minimum behind 0.3 Ω: its own running current pulls the input below start, so it toggles",
    procedure: "review",
    rule: "start-no-chatter",
    bad: review(chatterReq(0.3), idealDiode(logicLevel)),
    twin: review(chatterReq(0.05), idealDiode(logicLevel)),
  },
  {
    // Vth(T) = Vth(max) + k·(T − 25 °C) (docs/references.md, MOSFETs): 2.4 V + 6 mV/K·65 K = 2.79 V at
    // −40 °C, above the ~2.68 V a P-FET's gate gets at the 2.7 V bottom of a 3.3 V rail; the twin's
    // 2.0 V maximum gives 2.39 V. At 25 °C both would pass (2.4 V < 2.68 V).
    id: "pfet-below-threshold-when-cold",
    hazard: "start-up",
    why: "a logic-level P-FET on a 3.3 V rail whose 2.7 V minimum drives its gate above Vth(max) at 25 °C but not at −40 °C, where Vth is 0.39 V higher",
    procedure: "review",
    rule: "gate-overdrive-cold",
    bad: coldRail(2.4),
    twin: coldRail(2.0),
  },
  {
    id: "clamp-5j-under-load-dump-a",
    hazard: "clamp",
    // Closed form (clamp-energy.ts) at the sweep's worst point, Ri 0.5 ohm, Us 79 V, td 400 ms, tr 10 ms, UA 14 V, Vc 40 V: about 220 J.
    why: "an input clamp rated 5 J / 30 A takes about 220 J and 78 A in load dump A at its low-Ri corner (Ri 0.5 ohm, td 400 ms, with the 10 ms rise)",
    procedure: "review",
    rule: "clamp-energy",
    bad: review(
      {
        ...req12,
        transients: ["iso16750-2-load-dump-a-12v"],
        inputClamp: clamp({ energyJ: 5, peakCurrentA: 30, thermal: loadDumpClampNetwork }),
      },
      idealDiode(),
    ),
    twin: review(
      {
        ...req12,
        transients: ["iso16750-2-load-dump-a-12v"],
        inputClamp: clamp({ energyJ: 300, peakCurrentA: 100, thermal: loadDumpClampNetwork }),
      },
      idealDiode(),
    ),
  },
  {
    id: "clamp-30a-under-pulse-2a",
    hazard: "clamp",
    why: "an input clamp rated 30 A peak takes about 43 A from pulse 2a's 2 ohm source",
    procedure: "review",
    rule: "clamp-peak-current",
    bad: review(
      { ...req12, transients: ["iso7637-2-pulse-2a"], inputClamp: clamp({ energyJ: 5, peakCurrentA: 30 }) },
      idealDiode(),
    ),
    twin: review(
      { ...req12, transients: ["iso7637-2-pulse-2a"], inputClamp: clamp({ energyJ: 5, peakCurrentA: 60 }) },
      idealDiode(),
    ),
  },
  {
    id: "clamp-standoff-below-supply",
    hazard: "clamp",
    why: "a clamp standing off 14 V conducts the 16 V steady maximum of a 12 V system",
    procedure: "review",
    rule: "clamp-standoff",
    bad: review(
      {
        ...req12,
        supply: { class: "vehicle-12v-b", jumpStartV: 16, longTermOvervoltageV: 16 },
        inputClamp: clamp({ standoffV: 14, clampV: 22 }),
      },
      idealDiode(),
    ),
    twin: review(
      {
        ...req12,
        supply: { class: "vehicle-12v-b", jumpStartV: 16, longTermOvervoltageV: 16 },
        inputClamp: clamp({ standoffV: 17, clampV: 24 }),
      },
      idealDiode(),
    ),
  },
  {
    id: "clamp-over-its-peak-pulse-power",
    hazard: "clamp",
    // Closed forms (clamp-energy.ts, clamp-rating.ts): pulse 2a through 2 ohm with the 3 A load, VBR 28 V,
    // Rd 0.2 ohm: about 41 A at 36 V, about 1.5 kW, 11 us to half current; a 250 W (1 ms) rating allows
    // 250 * sqrt(1 ms / 11 us) * (150 - 85)/125 = about 1.2 kW at the 85 degC ambient, a 600 W one about 2.9 kW.
    why: "a clamp rated 250 W at 10/1000 us takes about 1.5 kW from pulse 2a, above the 1.2 kW its rating allows at that width and 85 degC",
    procedure: "review",
    rule: "clamp-peak-power",
    bad: review(
      {
        ...req12,
        transients: ["iso7637-2-pulse-2a"],
        inputClamp: clamp({ breakdownV: 28, peakCurrentA: 60, peakPulsePowerW: 250, tjMaxC: 150 }),
      },
      idealDiode(),
    ),
    twin: review(
      {
        ...req12,
        transients: ["iso7637-2-pulse-2a"],
        inputClamp: clamp({ breakdownV: 28, peakCurrentA: 60, peakPulsePowerW: 600, tjMaxC: 150 }),
      },
      idealDiode(),
    ),
  },
  {
    id: "clamp-hot-over-pulse-1-train",
    hazard: "clamp",
    // Closed forms (clamp-energy.ts, clamp-train.ts): pulse 1 (−150 V, 10 ohm, td 2 ms) into a 30 V clamp, about
    // 0.19 J and 360 W a pulse, 500 pulses 0.5 s apart (0.37 W on average for 250 s) from 85 degC: through a 200 K/W,
    // 60 s tail about 74 K of rise (mean power times R times 1 − e^(−250/60)), through a 100 K/W one about 37 K,
    // plus about 9 K of the last pulse in the fast terms.
    why: "an input clamp well within its 100 J single-pulse rating reaches about 170 degC over ISO 7637-2 pulse 1's 500-pulse train on a 200 K/W mounting; on a 100 K/W one it stays near 130 degC",
    procedure: "review",
    rule: "clamp-train-tj",
    bad: review(
      {
        ...req12,
        transients: ["iso7637-2-pulse-1-12v"],
        inputClamp: clamp({ clampV: 30, thermal: clampNetwork(200) }),
      },
      idealDiode(),
    ),
    twin: review(
      {
        ...req12,
        transients: ["iso7637-2-pulse-1-12v"],
        inputClamp: clamp({ clampV: 30, thermal: clampNetwork(100) }),
      },
      idealDiode(),
    ),
  },
  {
    id: "clamp-standoff-below-telecom-abnormal",
    hazard: "clamp",
    why: "a 58 V stand-off clamp on a -48 V feed clears the 57 V normal range but conducts in the abnormal range up to 60 V (ETSI EN 300 132-2, memory)",
    procedure: "review",
    rule: "clamp-standoff-overvoltage",
    bad: review(
      { ...req48, inputClamp: clamp({ standoffV: 58, clampV: 80 }) },
      idealDiode({ vdsMaxV: 100 }, { maxInputV: 100, reverseRatingV: 100 }),
    ),
    twin: review(
      { ...req48, inputClamp: clamp({ standoffV: 64, clampV: 85 }) },
      idealDiode({ vdsMaxV: 100 }, { maxInputV: 100, reverseRatingV: 100 }),
    ),
  },
  {
    id: "clamp-standoff-below-jump-start",
    hazard: "clamp",
    why: "an 18 V stand-off clamp on a 12 V vehicle line conducts for a minute at the 24 V jump start",
    procedure: "review",
    rule: "clamp-standoff-jump-start",
    bad: review({ ...req12, inputClamp: clamp({ standoffV: 18, clampV: 30 }) }, idealDiode()),
    twin: review({ ...req12, inputClamp: clamp({ standoffV: 26, clampV: 40 }) }, idealDiode()),
  },
  {
    id: "ideal-diode-avalanche-energy",
    hazard: "turn-off",
    why: "a 10 uH loop is cut at the reverse threshold at about 9 A: the MOSFET absorbs about 0.5 mJ, above its 0.3 mJ avalanche rating derated to the event's 88 °C",
    procedure: "review",
    rule: "avalanche-energy",
    bad: review(
      { ...req12, turnOff: { ...turnOffEvent, loop: { resistanceOhm: "20 mOhm", inductanceH: "10 uH" } } },
      idealDiode({ avalancheEnergyJ: "0.3 mJ" }),
    ),
    twin: review(
      { ...req12, turnOff: { ...turnOffEvent, loop: { resistanceOhm: "20 mOhm", inductanceH: "10 uH" } } },
      idealDiode({ avalancheEnergyJ: "150 mJ" }),
    ),
  },
  {
    id: "ideal-diode-turn-off-train-hot",
    hazard: "turn-off",
    // Closed form (clamp-train.ts): about 0.5 mJ a cut, 10,000 cuts a second average about 5 W, through 45 K/W
    // well past Tj(max) from the event's ~88 °C; 100 a second average 0.05 W, about 2 K.
    why: "the 10 uH cut at about 9 A puts about 0.5 mJ into the MOSFET each time, far within its 150 mJ rating once, but repeated every 0.1 ms its junction climbs past 175 °C; every 10 ms it stays near the event's Tj",
    procedure: "review",
    rule: "turn-off-train-tj",
    bad: trainReview(1e-4),
    twin: trainReview(1e-2),
  },
  {
    id: "ideal-diode-avalanche-energy-hot-start",
    hazard: "turn-off",
    why: "the same 10 uH cut at about 9 A puts about 0.5 mJ into the MOSFET, within its 1 mJ rating at 25 °C but not within that rating derated to the event's 150 °C start (1 mJ·(175 − 150)/(175 − 25) ≈ 0.17 mJ)",
    procedure: "review",
    rule: "avalanche-energy",
    bad: review(
      {
        ...req12,
        turnOff: { ...turnOffEvent, tjC: "150 degC", loop: { resistanceOhm: "20 mOhm", inductanceH: "10 uH" } },
      },
      idealDiode({ avalancheEnergyJ: "1 mJ" }),
    ),
    twin: review(
      {
        ...req12,
        turnOff: { ...turnOffEvent, tjC: "150 degC", loop: { resistanceOhm: "20 mOhm", inductanceH: "10 uH" } },
      },
      idealDiode({ avalancheEnergyJ: "5 mJ" }),
    ),
  },
  {
    id: "ideal-diode-repetitive-avalanche-energy",
    hazard: "turn-off",
    why: "the 10 uH cut at about 9 A repeats in service: about 0.5 mJ a time is far within the 150 mJ single-pulse rating but above the MOSFET's 0.3 mJ repetitive rating EAR",
    procedure: "review",
    rule: "avalanche-energy-repetitive",
    bad: review(
      {
        ...req12,
        turnOff: { ...turnOffEvent, repetitive: true, loop: { resistanceOhm: "20 mOhm", inductanceH: "10 uH" } },
      },
      idealDiode({ repetitiveAvalancheEnergyJ: "0.3 mJ" }),
    ),
    twin: review(
      {
        ...req12,
        turnOff: { ...turnOffEvent, repetitive: true, loop: { resistanceOhm: "20 mOhm", inductanceH: "10 uH" } },
      },
      idealDiode({ repetitiveAvalancheEnergyJ: "1 mJ" }),
    ),
  },
  {
    id: "ideal-diode-vds-breakdown-cold",
    hazard: "transient",
    why: "a 44 V input clamp holds pulse 1 to about 57.5 V across the blocking 60 V MOSFET: within its 25 °C rating, above its breakdown at −40 °C (60 V·(1 − 0.001·65) = 56.1 V)",
    procedure: "review",
    rule: "fet-vds-reverse-transient-cold",
    bad: review({ ...req12, transients: ["iso7637-2-pulse-1-12v"], inputClamp: clamp({ clampV: 44 }) }, idealDiode()),
    twin: review({ ...req12, transients: ["iso7637-2-pulse-1-12v"], inputClamp: clamp({ clampV: 36 }) }, idealDiode()),
  },
  {
    id: "ideal-diode-avalanche-current",
    hazard: "turn-off",
    why: "the reverse current at turn-off exceeds the MOSFET's avalanche current rating IAS though the energy is within EAS",
    procedure: "review",
    rule: "avalanche-current",
    bad: review(
      { ...req12, turnOff: { ...turnOffEvent, timing: { reverseThresholdV: "30 mV", turnOffDelayS: "5 us" } } },
      idealDiode({ avalancheEnergyJ: "2 J", avalancheCurrentA: "2 A" }),
    ),
    twin: review(
      { ...req12, turnOff: { ...turnOffEvent, timing: { reverseThresholdV: "30 mV", turnOffDelayS: "5 us" } } },
      idealDiode({ avalancheEnergyJ: "2 J", avalancheCurrentA: "400 A" }),
    ),
  },
  {
    id: "controller-start-above-min-supply",
    hazard: "start-up",
    why: "a controller that starts at 9 V on a 12 V code B supply whose minimum is 8 V",
    procedure: "review",
    rule: "start-at-min-supply",
    bad: review(req12, idealDiode({}, { startV: 9 })),
    twin: review(req12, idealDiode({}, { startV: 3.2 })),
  },
  {
    id: "controller-start-above-crank-bottom",
    hazard: "start-up",
    why: "a controller that starts at 5 V passes the 8 V class minimum but the crank profile falls to 4.5 V",
    procedure: "review",
    rule: "start-at-profile-minimum",
    bad: review({ ...req12, startProfile: crank }, idealDiode({}, { startV: 5 })),
    twin: review({ ...req12, startProfile: crank }, idealDiode({}, { startV: 3.2 })),
  },
  {
    id: "load-drops-out-in-crank",
    hazard: "start-up",
    why: "an 8 W constant-power load needing 5 V behind a PN diode loses its operating point at the 4.5 V crank bottom",
    procedure: "review",
    rule: "start-profile-no-dropout",
    bad: review(
      { ...req12, load: { kind: "constant-power", powerW: 8, minVoltageV: 5 }, loadMinV: 3, startProfile: crank },
      pn({ thermal: { kind: "junction-ambient", rthJaKPerW: 20 } }),
    ),
    twin: review(
      { ...req12, load: { kind: "constant-power", powerW: 8, minVoltageV: 3 }, loadMinV: 3, startProfile: crank },
      pn({ thermal: { kind: "junction-ambient", rthJaKPerW: 20 } }),
    ),
  },
  {
    id: "inrush-uncontrolled-into-2200uF",
    hazard: "start-up",
    why: "an ideal-diode FET switched fully on into 2200 uF at 16 V: about 3.5 kA for tens of us, the whole ½·C·V² = 0.28 J in the channel, Tj far above 175 °C (twin: the gate slews the output at 1 V/ms, 35 W for 16 ms)",
    procedure: "review",
    rule: "inrush-tj",
    bad: reviewZth(
      { ...req12, inrush: { outputCapacitanceF: "2200 uF", inputV: "16 V", load: { kind: "none" } } },
      idealDiode(),
      fetZth,
    ),
    twin: reviewZth(
      {
        ...req12,
        inrush: { outputCapacitanceF: "2200 uF", inputV: "16 V", slewVPerS: "1000 V/s", load: { kind: "none" } },
      },
      idealDiode(),
      fetZth,
    ),
  },
  {
    id: "inrush-slew-outside-soa",
    hazard: "start-up",
    why: "an ideal-diode FET slewing 2200 uF at 1 V/ms holds 2.2 A at 16 V for an 8 ms equivalent pulse: within Tj(max) by its Zth, but its SOA lines allow 3.5 A there at a 25 °C case, 2.1 A from 85 °C (twin: 0.5 V/ms, 1.1 A for 16 ms against 1.6 A)",
    procedure: "review",
    rule: "inrush-soa",
    bad: reviewZth(
      {
        ...req12,
        inrush: { outputCapacitanceF: "2200 uF", inputV: "16 V", slewVPerS: "1000 V/s", load: { kind: "none" } },
      },
      idealDiode({ soa: soaLines }),
      fetZth,
    ),
    twin: reviewZth(
      {
        ...req12,
        inrush: { outputCapacitanceF: "2200 uF", inputV: "16 V", slewVPerS: "500 V/s", load: { kind: "none" } },
      },
      idealDiode({ soa: soaLines }),
      fetZth,
    ),
  },
  {
    id: "inrush-current-limit-thermal-shutdown",
    hazard: "start-up",
    why: "a 6 A current-limited switch charging 4700 uF to 16 V beside a 3 A load needs C·V/(Ilim − IL) = 25 ms at 96 W: its 160 °C thermal shutdown comes first and the product never starts (twin: 470 uF, 2.5 ms)",
    procedure: "review",
    rule: "inrush-completes",
    bad: reviewZth(
      { ...req12, inrush: { outputCapacitanceF: "4700 uF", inputV: "16 V" } },
      integratedSwitch({ thermalShutdownC: 160 }),
      switchZth,
    ),
    twin: reviewZth(
      { ...req12, inrush: { outputCapacitanceF: "470 uF", inputV: "16 V" } },
      integratedSwitch({ thermalShutdownC: 160 }),
      switchZth,
    ),
  },
  {
    id: "inrush-at-jump-start-thermal-shutdown",
    hazard: "start-up",
    why: "the same 6 A switch (160 °C shutdown) and 470 uF beside a 3 A load that completes at the steady 16 V, switched on at the 12 V system's 24 V jump start (the inrush's default input): C·V/(Ilim − IL) = 3.76 ms at up to 144 W, and it shuts down after about 0.95 ms (twin: 150 uF, 1.2 ms, Tj 134 °C)",
    procedure: "review",
    rule: "inrush-completes",
    bad: reviewZth(
      { ...req12, inrush: { outputCapacitanceF: "470 uF" } },
      integratedSwitch({ thermalShutdownC: 160 }),
      switchZth,
    ),
    twin: reviewZth(
      { ...req12, inrush: { outputCapacitanceF: "150 uF" } },
      integratedSwitch({ thermalShutdownC: 160 }),
      switchZth,
    ),
  },
  {
    id: "inrush-converter-stalls-at-its-start",
    hazard: "start-up",
    why: "a 4.5 A current-limited switch ahead of a 30 W converter that starts at 6 V: its steady draw (30 W/8 V = 3.75 A at the class minimum) is within the limit, but at its start the converter takes 30 W/6 V = 5 A, more than the limit (4.5 A·6 V = 27 W), so the output falls back below its start each time and cycles at the converter's lockout, never reaching 24 V (twin: a 6 A limit, 36 W at 6 V: charges in 0.97 ms)",
    procedure: "review",
    rule: "inrush-completes",
    bad: reviewZth(
      {
        ...req12,
        load: { kind: "constant-power", powerW: 30, minVoltageV: 6 },
        inrush: { outputCapacitanceF: "150 uF" },
      },
      integratedSwitch({ currentLimitA: 4.5 }),
      switchZth,
    ),
    twin: reviewZth(
      {
        ...req12,
        load: { kind: "constant-power", powerW: 30, minVoltageV: 6 },
        inrush: { outputCapacitanceF: "150 uF" },
      },
      integratedSwitch({ currentLimitA: 6 }),
      switchZth,
    ),
  },
  {
    id: "inrush-pair-limit-outside-soa",
    hazard: "start-up",
    why: "a back-to-back pair behind a hot-swap controller's 2 A limit charging 1 mF to the 24 V jump start: the shared gate leaves the input-side FET in its linear region holding the whole 24 V at 2 A for a 6 ms equivalent pulse (the output-side FET conducts across its body diode), where its SOA lines allow 1.44 A from 85 °C; read at half the drop each (12 V) it would seem to pass at 3.4 A (twin: a 0.5 A limit, 24 ms against 0.78 A)",
    procedure: "review",
    rule: "inrush-soa",
    bad: reviewZth(
      { ...req12, inrush: { outputCapacitanceF: "1 mF", currentLimitA: 2, load: { kind: "none" } } },
      backToBack({ soa: soaLines }),
      pairZth,
    ),
    twin: reviewZth(
      { ...req12, inrush: { outputCapacitanceF: "1 mF", currentLimitA: 0.5, load: { kind: "none" } } },
      backToBack({ soa: soaLines }),
      pairZth,
    ),
  },
  {
    id: "switch-cutoff-inside-supply-range",
    hazard: "load",
    why: "an integrated switch whose overvoltage cut-off is 15 V on a 12 V code B supply that runs to 16 V: it opens in normal service (twin: 30 V)",
    procedure: "review",
    rule: "switch-cutoff-above-supply",
    bad: review(req12, integratedSwitch({ overvoltageCutoffV: 15, overvoltageResponseS: "10 us" })),
    twin: review(req12, integratedSwitch({ overvoltageCutoffV: 30, overvoltageResponseS: "10 us" })),
  },
  {
    id: "switch-cutoff-hysteresis-holds-supply-off",
    hazard: "load",
    why: "an integrated switch cutting off at 20 V with 5 V hysteresis on a 12 V code B supply: the 24 V jump start opens it, and it recloses only below 15 V, so at the supply's normal 16 V (and the 18 V long-term overvoltage) the load stays unpowered after the excursion (twin: 1 V hysteresis, recloses below 19 V)",
    procedure: "review",
    rule: "switch-cutoff-above-supply",
    bad: review(req12, integratedSwitch({ overvoltageCutoffV: 20, overvoltageHysteresisV: 5 })),
    twin: review(req12, integratedSwitch({ overvoltageCutoffV: 20, overvoltageHysteresisV: 1 })),
  },
  {
    id: "switch-retries-after-thermal-shutdown-in-service",
    hazard: "thermal",
    why: "an auto-retrying integrated switch with a 150 °C shutdown and 20 K hysteresis carrying 5 A through 50 K/W: its hot corners settle near 158 °C, so it cycles between 130 and 150 °C and the load is powered only part of the time (twin: 40 K/W, about 137 °C, never trips)",
    procedure: "review",
    rule: "switch-thermal-shutdown-in-service",
    bad: review(
      { ...req12, load: { kind: "constant-current", currentA: 5 } },
      integratedSwitch({
        tjMaxC: 175,
        thermalShutdownC: 150,
        afterThermalShutdown: { mode: "auto-retry", hysteresisK: 20 },
        thermal: { kind: "junction-ambient", rthJaKPerW: 50 },
      }),
    ),
    twin: review(
      { ...req12, load: { kind: "constant-current", currentA: 5 } },
      integratedSwitch({
        tjMaxC: 175,
        thermalShutdownC: 150,
        afterThermalShutdown: { mode: "auto-retry", hysteresisK: 20 },
        thermal: { kind: "junction-ambient", rthJaKPerW: 40 },
      }),
    ),
  },
  {
    id: "switch-thermal-shutdown-along-start-profile",
    hazard: "start-up",
    why: "a 4.2 A current-limited switch ahead of a 4 ohm load, its steady corners fully on (4 A at 16 V, about 88 °C), given a start-up profile that holds 18 V for 3 s: there it limits, (18 − 16.8) V × 4.2 A = 5 W through 5 K/W toward 110 °C, and its junction (one Foster pole, 0.5 s) reaches the 105 °C shutdown after about 0.8 s, dropping the load (twin: 0.2 s at 18 V, about 94 °C)",
    procedure: "review",
    rule: "switch-thermal-shutdown-in-service",
    bad: reviewZth(
      { ...req12, load: { kind: "resistive", resistanceOhm: 4 }, startProfile: holdAt18V(3) },
      integratedSwitch({
        currentLimitA: 4.2,
        thermalShutdownC: 105,
        thermal: { kind: "junction-ambient", rthJaKPerW: 5 },
      }),
      { kind: "foster", terms: [{ rKPerW: 5, tauS: 0.5 }] },
    ),
    twin: reviewZth(
      { ...req12, load: { kind: "resistive", resistanceOhm: 4 }, startProfile: holdAt18V(0.2) },
      integratedSwitch({
        currentLimitA: 4.2,
        thermalShutdownC: 105,
        thermal: { kind: "junction-ambient", rthJaKPerW: 5 },
      }),
      { kind: "foster", terms: [{ rKPerW: 5, tauS: 0.5 }] },
    ),
  },
  {
    id: "switch-current-limit-below-load",
    hazard: "load",
    why: "an integrated switch limiting at 6 A ahead of an 8 A load: it holds 6 A and the constant-current load collapses at every full-load corner (twin: a 10 A limit)",
    procedure: "review",
    rule: "switch-current-limit-above-load",
    bad: review(
      { ...req12, load: { kind: "constant-current", currentA: 8 } },
      integratedSwitch({ thermal: { kind: "junction-ambient", rthJaKPerW: 10 } }),
    ),
    twin: review(
      { ...req12, load: { kind: "constant-current", currentA: 8 } },
      integratedSwitch({ currentLimitA: 10, thermal: { kind: "junction-ambient", rthJaKPerW: 10 } }),
    ),
  },
  {
    id: "switch-collapses-at-the-lowest-supply",
    hazard: "load",
    why: "an integrated switch limiting at 6 A ahead of a 48 W constant-power load on a 12 V code B supply: at the 8 V bottom of the supply the load wants 6 A or more, the switch holds 6 A, and the load collapses at those corners only (no operating point; the corner rules cannot be read there, so the set was only incomplete); the twin's 10 A limit carries it",
    procedure: "review",
    rule: "corner-solves",
    bad: review(
      { ...req12, load: { kind: "constant-power", powerW: 48, minVoltageV: 5 } },
      integratedSwitch({ thermal: { kind: "junction-ambient", rthJaKPerW: 10 } }),
    ),
    twin: review(
      { ...req12, load: { kind: "constant-power", powerW: 48, minVoltageV: 5 } },
      integratedSwitch({ currentLimitA: 10, thermal: { kind: "junction-ambient", rthJaKPerW: 10 } }),
    ),
  },
  {
    id: "switch-current-limit-at-its-datasheet-minimum",
    hazard: "load",
    why: "an integrated switch limiting at 6 A typical but 5 A at its datasheet minimum ahead of a 5.5 A load: a part at the low end of the limit holds 5 A and the load collapses, although the typical part carries it (twin: a 5.8 A minimum)",
    procedure: "review",
    rule: "switch-current-limit-above-load",
    bad: {
      requirement: { ...req12, load: { kind: "constant-current", currentA: 5.5 } },
      candidates: [
        {
          stage: integratedSwitch({ thermal: { kind: "junction-ambient", rthJaKPerW: 10 } }),
          datasheetMax: { rdsOnFactor: 1, forwardVoltageFactor: 1, currentLimitMinA: 5 },
        },
      ],
    },
    twin: {
      requirement: { ...req12, load: { kind: "constant-current", currentA: 5.5 } },
      candidates: [
        {
          stage: integratedSwitch({ thermal: { kind: "junction-ambient", rthJaKPerW: 10 } }),
          datasheetMax: { rdsOnFactor: 1, forwardVoltageFactor: 1, currentLimitMinA: 5.8 },
        },
      ],
    },
  },
  {
    id: "switch-heats-at-its-current-limit",
    hazard: "thermal",
    why: "a 3 A current-limited switch ahead of a 4 ohm load on a 12 V code B supply: above 12 V the load would draw more than 3 A, the switch holds 3 A with the load at I_lim·R = 12 V and drops the rest, (16 V − 12 V) × 3 A = 12 W through 10 K/W: about 205 °C at 85 °C ambient (twin: a 6 A limit, never reached)",
    procedure: "review",
    rule: "tj-limit",
    bad: review(
      { ...req12, load: { kind: "resistive", resistanceOhm: 4 } },
      integratedSwitch({ currentLimitA: 3, thermal: { kind: "junction-ambient", rthJaKPerW: 10 } }),
    ),
    twin: review(
      { ...req12, load: { kind: "resistive", resistanceOhm: 4 } },
      integratedSwitch({ currentLimitA: 6, thermal: { kind: "junction-ambient", rthJaKPerW: 10 } }),
    ),
  },
  {
    id: "switch-thermal-shutdown-in-service",
    hazard: "thermal",
    why: "an integrated switch rated to 175 °C with a 150 °C thermal shutdown carrying 5 A through 50 K/W: its hot corners settle near 158 °C (Tj = Ta + Rth·P, 85 °C + 50 K/W × about 1.47 W), inside the rating but past the shutdown, so the switch turns off and the load loses its supply in service (twin: 40 K/W, about 137 °C)",
    procedure: "review",
    rule: "switch-thermal-shutdown-in-service",
    bad: review(
      { ...req12, load: { kind: "constant-current", currentA: 5 } },
      integratedSwitch({ tjMaxC: 175, thermalShutdownC: 150, thermal: { kind: "junction-ambient", rthJaKPerW: 50 } }),
    ),
    twin: review(
      { ...req12, load: { kind: "constant-current", currentA: 5 } },
      integratedSwitch({ tjMaxC: 175, thermalShutdownC: 150, thermal: { kind: "junction-ambient", rthJaKPerW: 40 } }),
    ),
  },
  {
    id: "load-dump-reaches-the-load",
    hazard: "load",
    why: "a switch without an overvoltage cut-off passes the 35 V suppressed load dump to a load rated 32 V (twin: a 30 V cut-off opening in 10 us lets 30.1 V through)",
    procedure: "review",
    rule: "load-overvoltage",
    bad: review({ ...req12, loadMaxV: 32, transients: ["iso16750-2-load-dump-b-12v"] }, integratedSwitch()),
    twin: review(
      { ...req12, loadMaxV: 32, transients: ["iso16750-2-load-dump-b-12v"] },
      integratedSwitch({ overvoltageCutoffV: 30, overvoltageResponseS: "10 us" }),
    ),
  },
  {
    id: "standby-quiescent-over-budget",
    hazard: "standby",
    why: "an 80 uA controller on a 50 uA standby budget",
    procedure: "review",
    rule: "standby-quiescent",
    sets: ["default", "vehicle"],
    bad: review({ ...req12, standbyBudgetA: "50 uA" }, idealDiode()),
    twin: review({ ...req12, standbyBudgetA: "100 uA" }, idealDiode({}, { quiescentA: "40 uA" })),
  },
  {
    id: "hold-up-short-of-20ms",
    hazard: "hold-up",
    why: "1000 uF at 12 V into 20 W down to 8 V holds about 2 ms, not the required 20 ms",
    procedure: "holdUp",
    rule: "hold-up-time",
    bad: holdUp("20 ms"),
    twin: holdUp("1 ms"),
  },
  {
    id: "pfet-gate-resistor-lets-output-go-negative",
    hazard: "turn-off",
    // Closed form (rlc-series.ts) with the gate lag of pfet-gate-off.ts: −14 V held at the input, 1000 uF through
    // 52 mOhm of loop and channel (and 10 mOhm ESR) discharges with R·C ≈ 62 us; a 10 kOhm / 30 nC (at 10 V) gate
    // lags by 30 us, so the channel is still on when the output crosses 0 V and lets go at about −5 V (59 us); a
    // 100 ohm gate resistor (0.3 us) lets go near its 2 V threshold (32 us). Both draw about 310 A back at first
    // (the P-FET's IAS is given as 400 A, invented).
    why: "a P-FET whose gate is tied to ground through 10 kOhm stays on while a −14 V input pulls the output capacitor to about −5 V, beyond the 0.5 V reverse voltage the load tolerates; through 100 ohm the channel lets go near its threshold",
    procedure: "turnOff",
    rule: "load-reverse-voltage",
    bad: pfetNegativeInput("10 kOhm"),
    twin: pfetNegativeInput("100 Ohm"),
  },
  {
    id: "pfet-output-below-zero-under-pulse-1",
    hazard: "turn-off",
    // Closed form (rlc-series.ts, exponential forcing) with the gate lag of pfet-gate-off.ts: pulse 1 held at the
    // 36 V clamp only until the current back out of 47 uF exceeds what the generator sinks beyond the clamp (within
    // 0.3 us), then −150 V·e^(−t/τ) behind its 10 ohm draws about 16 A back; a 100 kOhm / 30 nC (at 10 V) gate
    // lags by 0.3 ms, so the channel is still on as the output follows the input to about −28 V; a 100 ohm gate
    // (0.3 us) lets go near its 2 V threshold after 33 us, C·ΔV = 47 uF × 11.4 V ≈ 0.54 mC lost.
    // The requirement's own turn-off event (a short through 1 ohm into a 10 ohm load) never goes below 0 V.
    why: "pulse 1 through a P-FET whose gate goes to ground through 100 kOhm pulls a 47 uF output to about −28 V before the channel lets go, beyond the 0.5 V reverse voltage the load tolerates; through 100 ohm the channel lets go near its threshold",
    procedure: "review",
    rule: "load-reverse-voltage",
    bad: pfetUnderPulse1("100 kOhm"),
    twin: pfetUnderPulse1("100 Ohm"),
  },
  {
    id: "low-side-nfet-output-below-zero-under-pulse-1",
    hazard: "turn-off",
    // The low-side N-FET's Vgs is the positive rail against its source at the module's ground: the
    // output, as a P-FET's |Vgs| is (ngspice, test/domain/review/pulse-back-conduction-low-side.test.ts).
    // With the same part, gate and loop as the P-FET design above, the same closed form: a 100 kOhm
    // gate (0.3 ms lag) keeps the channel on as the output follows pulse 1 to about −8 V; 100 ohm
    // lets go near the 2 V threshold.
    why: "pulse 1 through a low-side N-FET whose gate is fed from the positive rail through 100 kOhm pulls a 47 uF output to about −8 V before the channel lets go (its gate follows the output, not the input), beyond the 0.5 V reverse voltage the load tolerates; through 100 ohm the channel lets go near its threshold",
    procedure: "review",
    rule: "load-reverse-voltage",
    bad: lowSideUnderPulse1("100 kOhm"),
    twin: lowSideUnderPulse1("100 Ohm"),
  },
  {
    id: "pfet-body-diode-holds-output-under-pulse-1",
    hazard: "transient",
    // The back-conduction model (review-pulse-back-conduction.ts) with the 100 ohm gate of the design
    // above: the 36 V clamp holds pulse 1's input while the channel conducts backwards; it lets go
    // with the 47 uF output still near its 2 V threshold, so the body diode must block 37.9 V, more
    // than its 37 V breakdown (the event's clamp-below-drive: it avalanches; pulse-stress.ts takes
    // that drive as the stress figure), beyond a 37 V Vds(max). The figure with the output taken at
    // 0 V (36 V) passed this rule in the default and consumer sets (its cold-breakdown rule failed it
    // there already). ngspice on the same loop kind: test/domain/review/pulse-stress.test.ts.
    why: "pulse 1 clamped at 36 V through a P-FET rated 37 V: its channel lets go with the output still at 2 V, so its body diode holds 38 V, beyond its 37 V Vds(max); a 48 V part holds it (within every set's share of it and of its cold breakdown)",
    procedure: "review",
    rule: "fet-vds-reverse-transient",
    bad: fetUnderPulse1(pfet, "100 Ohm", { vdsMaxV: 37 }),
    twin: fetUnderPulse1(pfet, "100 Ohm", { vdsMaxV: 48 }),
  },
  {
    id: "pfet-output-below-zero-under-supply-surge",
    hazard: "turn-off",
    // Thevenin (two-source-thevenin.ts): the battery (24 V behind 2 ohm) and the surge generator
    // (24 V − 1 kV behind 2 ohm) are 24 V − 500 V·e^(−t/τ) behind 1 ohm, τ = 20 us/ln 2 ≈ 29 us; the 48 V
    // clamp (constant, no dynamic resistance) holds the input at −48 V until the generator alone carries the
    // loop current, 42 us. Into that stiff level the 10 uF output rings through 1 uH and the channel: with a
    // 100 kOhm / 30 nC (at 10 V) gate (0.3 ms) the channel lets go after 73 us with the output near −105 V.
    // A P-FET with its gate at ground cannot let go before its output is near 0 V, by then ~160 A flows and
    // the output swings to −38 V even through a 100 ohm gate: the twin is an ideal-diode controller with a
    // 100 V MOSFET, which blocks (reverse 48 + 24 = 72 V) and never lets the output follow the input.
    why: "a negative surge riding on a 24 V supply behind a 2 ohm field cable, held at −48 V by a stiff input clamp, through a P-FET whose gate goes to ground through 100 kOhm, pulls a 10 uF output to about −105 V, beyond the 0.5 V the load tolerates; an ideal-diode controller blocks it",
    procedure: "review",
    rule: "load-reverse-voltage",
    bad: pfetUnderSupplySurge("100 kOhm"),
    twin: pfetUnderSupplySurge(undefined),
  },
  {
    id: "pfet-pulse-1-held-by-clamp",
    hazard: "turn-off",
    // Closed form with the clamp's hold (turn-off-input-clamp.ts, checked against ngspice): pulse 1 at a TVS of
    // 28.9 V (0.185 ohm) is held near −31.6 V until the current back out of 470 uF passes what the generator
    // sinks beyond the clamp (0.35 us); from then on −150 V·e^(−t/τ) behind 10 ohm draws about 16 A back. A
    // 100 kOhm / 100 nC (at 10 V) gate lags by 1 ms: the output reaches about −12.4 V before the channel lets
    // go (1.06 ms). Before the hold was modelled the input decayed from the clamp's −31 V at once, about 4 A
    // back, and the output stayed above −5.1 V: within the 7 V the load tolerates, a pass
    // (test/api/review-pulse-clamp-hold.test.ts shows both). A 100 ohm gate (1 us) lets go near its threshold.
    why: "pulse 1 at a P-FET behind a 28.9 V input clamp, gate to ground through 100 kOhm, pulls a 470 uF output to about −12.4 V, beyond the 7 V reverse voltage the load tolerates (the clamp level decaying at once said −5.1 V); through 100 ohm the channel lets go near its threshold",
    procedure: "review",
    rule: "load-reverse-voltage",
    bad: pfetPulse1HeldByClamp("100 kOhm"),
    twin: pfetPulse1HeldByClamp("100 Ohm"),
  },
  {
    id: "bridge-element-peak-over-ifrm",
    hazard: "bridge",
    why: "a capacitor-input bridge's charging pulse is several times the load current: above a 3 A IFRM",
    procedure: "bridgeAc",
    rule: "element-peak-current",
    bad: bridgeAc("3 A"),
    twin: bridgeAc("40 A"),
  },
];
