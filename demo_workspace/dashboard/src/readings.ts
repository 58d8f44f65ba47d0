import { ReadingPoint } from "./types";

export function averageMoisture(points: ReadingPoint[]): number {
  if (points.length === 0) {
    return 0;
  }
  let total = 0;
  for (const point of points) {
    total += point.moisture;
  }
  return total / points.length;
}

export function averageTemperature(points: ReadingPoint[]): number {
  if (points.length === 0) {
    return 0;
  }
  let total = 0;
  for (const point of points) {
    total += point.temperature;
  }
  return total / points.length;
}

export function latestPoint(points: ReadingPoint[]): ReadingPoint | null {
  let latest: ReadingPoint | null = null;
  for (const point of points) {
    if (latest === null || point.at > latest.at) {
      latest = point;
    }
  }
  return latest;
}

export function pointsForSensor(points: ReadingPoint[], sensorId: string): ReadingPoint[] {
  return points.filter((point) => point.sensorId === sensorId);
}

export function sensorIds(points: ReadingPoint[]): string[] {
  const ids = new Set<string>();
  for (const point of points) {
    ids.add(point.sensorId);
  }
  return Array.from(ids).sort();
}

export function pointsSince(points: ReadingPoint[], since: Date): ReadingPoint[] {
  const zone = points.filter((point) => new Date(point.at) >= since);
  return zone.sort((first, second) => first.at.localeCompare(second.at));
}

export function moistureRange(points: ReadingPoint[]): [number, number] {
  let lowest = Infinity;
  let highest = -Infinity;
  for (const point of points) {
    lowest = Math.min(lowest, point.moisture);
    highest = Math.max(highest, point.moisture);
  }
  return [lowest, highest];
}

export function hourlyAverages(points: ReadingPoint[]): number[] {
  const buckets: number[][] = Array.from({ length: 24 }, () => []);
  for (const point of points) {
    const hour = new Date(point.at).getHours();
    buckets[hour].push(point.moisture);
  }
  return buckets.map((moistures) =>
    moistures.length ? moistures.reduce((sum, moisture) => sum + moisture, 0) / moistures.length : 0,
  );
}

export function smooth(points: ReadingPoint[], windowSize: number): ReadingPoint[] {
  const smoothed: ReadingPoint[] = [];
  for (let index = 0; index < points.length; index++) {
    const start = Math.max(0, index - windowSize + 1);
    const window = points.slice(start, index + 1);
    const moisture = averageMoisture(window);
    smoothed.push({ ...points[index], moisture });
  }
  return smoothed;
}

export function moistureTrend(points: ReadingPoint[]): number {
  if (points.length < 2) {
    return 0;
  }
  const first = points[0];
  const last = points[points.length - 1];
  const hours = (new Date(last.at).getTime() - new Date(first.at).getTime()) / 3600000 || 1;
  return (last.moisture - first.moisture) / hours;
}

export function dropOutliers(points: ReadingPoint[], limit = 3): ReadingPoint[] {
  if (points.length < 3) {
    return points.slice();
  }
  const mean = averageMoisture(points);
  let variance = 0;
  for (const point of points) {
    variance += (point.moisture - mean) ** 2;
  }
  const spread = Math.sqrt(variance / points.length) || 1;
  return points.filter((point) => Math.abs(point.moisture - mean) / spread <= limit);
}
