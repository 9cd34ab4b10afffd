import { gaussLegendre } from "../physics/rlc-series.js";
import type { LoadModel } from "../solve/load-model.js";

export interface DischargeModel {
  /** Capacitor voltage when the discharge starts, V. */
  readonly capacitorV: number;
  readonly capacitanceF: number;
  readonly esrOhm: number;
  readonly load: LoadModel;
  readonly loadMinV: number;
  /** A constant extra drain from the output node (a blocking stage's reverse leakage), A. */
  readonly leakageA: number;
}

export type DischargeOutcome =
  | { readonly outcome: "holds"; readonly timeS: number; readonly method: string; readonly startOutputV: number }
  | { readonly outcome: "below-minimum-at-start"; readonly startOutputV: number; readonly reason: string }
  | { readonly outcome: "collapse"; readonly reason: string }
  | { readonly outcome: "no-drain"; readonly reason: string };

/**
 * Time for the output to fall from the capacitor voltage V0 to the load's minimum Vmin with no
 * input, the capacitor C (with ESR) alone feeding the load and a constant leakage I_lk:
 * - constant current I (+ I_lk): linear, t = C·(V0 − ESR·I − Vmin)/I;
 * - resistive R (+ I_lk): exponential, v_C + I_lk·R → 0 with τ = C·(R + ESR):
 *   t = τ·ln((V0 + I_lk·R)/(Vmin·(R + ESR)/R + ESR·I_lk + I_lk·R));
 * - constant power P: with ESR = 0 and no leakage the energy form t = C·(V0² − Vmin²)/(2P);
 *   otherwise t = C·∫ dv_C / (P/v_out + I_lk) from v_C(Vmin) to V0, with v_out the larger root
 *   of v_out² − (v_C − ESR·I_lk)·v_out + ESR·P = 0, by Gauss-Legendre quadrature.
 * All follow from C·dv_C/dt = −(i_load + I_lk), v_out = v_C − ESR·(i_load + I_lk) (textbook).
 */
export function dischargeTime(m: DischargeModel): DischargeOutcome {
  const c = m.capacitanceF;
  const esr = m.esrOhm;
  const lk = m.leakageA;
  const v0 = m.capacitorV;
  const vmin = m.loadMinV;
  const load = m.load;
  switch (load.kind) {
    case "constant-current": {
      const i = load.currentA + lk;
      const start = v0 - esr * i;
      if (start <= vmin) return belowMin(start, vmin);
      if (!(i > 0))
        return { outcome: "no-drain", reason: "nothing draws current from the output: it holds indefinitely" };
      return {
        outcome: "holds",
        timeS: (c * (start - vmin)) / i,
        method: "linear discharge C·ΔV/I",
        startOutputV: start,
      };
    }
    case "resistive": {
      const r = load.resistanceOhm;
      const start = ((v0 - esr * lk) * r) / (r + esr);
      if (start <= vmin) return belowMin(start, vmin);
      const tau = c * (r + esr);
      const vcMin = (vmin * (r + esr)) / r + esr * lk;
      // The exponential tends to −I_lk·R: a minimum at or below it is never reached.
      if (!(vcMin + lk * r > 0))
        return {
          outcome: "no-drain",
          reason: `the resistive load's exponential discharge never takes the output down to the ${vmin} V minimum: it holds indefinitely`,
        };
      return {
        outcome: "holds",
        timeS: tau * Math.log((v0 + lk * r) / (vcMin + lk * r)),
        method: "exponential discharge τ = C·(R + ESR)",
        startOutputV: start,
      };
    }
    case "constant-power": {
      const p = load.powerW;
      const vout = (vc: number): number | undefined => {
        const a = vc - esr * lk;
        const disc = a * a - 4 * esr * p;
        return disc >= 0 && a > 0 ? (a + Math.sqrt(disc)) / 2 : undefined;
      };
      const start = vout(v0);
      if (start === undefined)
        return {
          outcome: "collapse",
          reason: "the capacitor ESR cannot pass the load's power even at the start: the output collapses",
        };
      if (start <= vmin) return belowMin(start, vmin);
      if (esr === 0 && lk === 0) {
        return {
          outcome: "holds",
          timeS: (c * (v0 * v0 - vmin * vmin)) / (2 * p),
          method: "energy form C·(V0² − Vmin²)/(2P)",
          startOutputV: start,
        };
      }
      // With ESR the output cannot fall below √(ESR·P) (the roots merge: the converter's current
      // no longer passes the ESR): a lower minimum ends at that collapse instead.
      const vEnd = Math.max(vmin, Math.sqrt(esr * p));
      const vcAtMin = vEnd > 0 ? vEnd + esr * (p / vEnd + lk) : esr * lk;
      const integrand = (vc: number): number => 1 / (p / (vout(vc) ?? vEnd) + lk);
      const method =
        vEnd > vmin
          ? `constant power with ESR and leakage, by quadrature of C·dv/(P/v + I), to the collapse at ${vEnd.toPrecision(4)} V (sqrt(ESR·P)) above the minimum`
          : "constant power with ESR and leakage, by quadrature of C·dv/(P/v + I)";
      return { outcome: "holds", timeS: c * gaussLegendre(integrand, vcAtMin, v0, 200), method, startOutputV: start };
    }
  }
}

function belowMin(start: number, vmin: number): DischargeOutcome {
  return {
    outcome: "below-minimum-at-start",
    startOutputV: start,
    reason: `the output starts at ${start.toPrecision(4)} V, not above the load's ${vmin} V minimum`,
  };
}
