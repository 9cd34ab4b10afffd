/**
 * Constants of the TR-BDF2 one-step method (R. E. Bank et al., "Transient simulation of silicon
 * devices and circuits", IEEE Trans. CAD 4(4), 1985; M. E. Hosea and L. F. Shampine, "Analysis
 * and implementation of TR-BDF2", Appl. Numer. Math. 20, 1996): a trapezoidal stage to
 * t + γh, then a second-order backward-difference stage to t + h. With γ = 2 − √2 both stages
 * have the same implicit form x − a·f(x) = b, and the method is L-stable (stiff conduction edges
 * do not ring) and second order.
 */
export const GAMMA = 2 - Math.SQRT2;
/** Trapezoidal stage: x_γ − (γh/2)·f(x_γ) = x_n + (γh/2)·f_n. */
export const TR_COEFF = GAMMA / 2;
/** BDF2 stage: x₁ − a₂h·f(x₁) = (x_γ − (1−γ)²·x_n) / (γ(2−γ)), a₂ = (1−γ)/(2−γ). */
export const BDF_COEFF = (1 - GAMMA) / (2 - GAMMA);
export const BDF_W_GAMMA = 1 / (GAMMA * (2 - GAMMA));
export const BDF_W_N = -((1 - GAMMA) ** 2) / (GAMMA * (2 - GAMMA));
/** Local truncation error constant: LTE = C·h³·x‴ with C = (−3γ² + 4γ − 2)/(12(2 − γ)). */
export const LTE_COEFF = Math.abs((-3 * GAMMA * GAMMA + 4 * GAMMA - 2) / (12 * (2 - GAMMA)));
/**
 * Weights of the interpolatory quadrature on the step's nodes 0, γ, 1 (exact for quadratics):
 * ∫₀¹ p = W0·p(0) + WG·p(γ) + W1·p(1).
 */
export const QUAD_WG = 1 / (6 * GAMMA * (1 - GAMMA));
export const QUAD_W1 = 0.5 - QUAD_WG * GAMMA;
export const QUAD_W0 = 1 - QUAD_WG - QUAD_W1;
