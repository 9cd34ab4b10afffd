/**
 * A single-pulse avalanche energy rating at the event's starting junction temperature, J.
 *
 * EAS is rated at 25 °C starting Tj; the datasheet's EAS-versus-starting-Tj curve falls close to
 * linearly to zero at Tj(max) (common practice, docs/references.md "MOSFETs"):
 *
 *   E(Tj) = EAS · (Tj,max − Tj) / (Tj,max − 25 °C), for 25 °C ≤ Tj ≤ Tj,max,
 *
 * 0 from Tj(max) up, and EAS below 25 °C: a colder start takes no credit above the rated figure
 * (the curve is not given there). A part whose Tj(max) is not above 25 °C has no derating range:
 * its rating holds only at or below 25 °C and is 0 above.
 */
export function avalancheEnergyAtTjJ(eas25J: number, tjMaxC: number, startTjC: number): number {
  if (startTjC <= 25) return eas25J;
  if (!(tjMaxC > 25) || startTjC >= tjMaxC) return 0;
  return (eas25J * (tjMaxC - startTjC)) / (tjMaxC - 25);
}
