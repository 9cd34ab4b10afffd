/** Charge-pump gate drive at an input voltage: linear between the points, flat outside (no allocation). */
export function gateDriveAt(
  c: { readonly gateDrive: readonly { readonly inputV: number; readonly gateSourceV: number }[] },
  inputV: number,
): number {
  const pts = c.gateDrive;
  const first = pts[0];
  if (first === undefined) return 0;
  if (inputV <= first.inputV) return first.gateSourceV;
  for (let i = 1; i < pts.length; i += 1) {
    const a = pts[i - 1];
    const b = pts[i];
    if (a && b && inputV <= b.inputV)
      return a.gateSourceV + ((b.gateSourceV - a.gateSourceV) * (inputV - a.inputV)) / (b.inputV - a.inputV);
  }
  return pts[pts.length - 1]?.gateSourceV ?? 0;
}

/** A voltage limited by an optional clamp. */
export function clampV(v: number, limit: number | undefined): number {
  return limit === undefined ? v : Math.min(v, limit);
}
