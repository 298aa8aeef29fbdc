import type { SurvivalCurve } from "@/lib/domain/survival";

// The step curve as chart points (percent), starting at day 0 with every bag still without roots.

export interface CurvePoint {
  day: number;
  share: number;
  band: [number, number];
}

export function toCurvePoints({ curve }: { curve: SurvivalCurve }): CurvePoint[] {
  const points: CurvePoint[] = [{ day: 0, share: 100, band: [100, 100] }];
  for (const s of curve.steps) {
    if (s.events === 0) continue;
    const point: CurvePoint = { day: s.time, share: s.survival * 100, band: [(s.lower ?? 0) * 100, (s.upper ?? 0) * 100] };
    if (points[points.length - 1].day === s.time) points[points.length - 1] = point;
    else points.push(point);
  }
  // Carry the last level to the last day a bag was followed, so unfinished bags show as the flat tail.
  const lastDay = curve.steps.length ? curve.steps[curve.steps.length - 1].time : 0;
  const tail = points[points.length - 1];
  if (lastDay > tail.day) points.push({ ...tail, day: lastDay });
  return points;
}
