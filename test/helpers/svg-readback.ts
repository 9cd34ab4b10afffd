import { DOMParser, type Element } from "@xmldom/xmldom";

/** Parse as XML; any warning or error of the parser fails the test. */
export function parseSvg(svg: string) {
  const problems: string[] = [];
  const doc = new DOMParser({ onError: (level, msg) => problems.push(`${level}: ${msg}`) }).parseFromString(
    svg,
    "image/svg+xml",
  );
  if (problems.length > 0) throw new Error(`SVG does not parse: ${problems.join("; ")}`);
  return doc;
}

export const byClass = (root: Element, cls: string) =>
  Array.from(root.getElementsByTagName("*")).filter((e) => (e.getAttribute("class") ?? "").split(" ").includes(cls));

/** The axis scale as drawn: the pixel→value line through the first and last tick of each axis. */
export function axisScales(svg: Element) {
  const axis = (cls: string, attr: "x1" | "y1") => {
    const g = byClass(svg, cls)[0];
    if (!g) throw new Error(`no ${cls}`);
    const ticks = Array.from(g.getElementsByTagName("line")).map((t) => ({
      px: Number(t.getAttribute(attr)),
      v: Number(t.getAttribute("data-value")),
    }));
    const a = ticks[0];
    const b = ticks[ticks.length - 1];
    if (!a || !b || a.px === b.px) throw new Error(`${cls} has too few ticks`);
    const perPx = (b.v - a.v) / (b.px - a.px);
    return { invert: (px: number) => a.v + (px - a.px) * perPx, perPx: Math.abs(perPx) };
  };
  return { x: axis("x-axis", "x1"), y: axis("y-axis", "y1") };
}

/** Vertices of the path's subpaths (d3-shape emits M and L commands only for a linear curve). */
export function pathPoints(d: string): [number, number][] {
  return [...d.matchAll(/[ML](-?[\d.]+),(-?[\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])]);
}
