import { ReadingPoint } from "./types";
import { averageMoisture } from "./readings";

export interface DayAverage {
  day: string;
  moisture: number;
  count: number;
}

export function dailyAverages(points: ReadingPoint[]): DayAverage[] {
  const buckets = new Map<string, ReadingPoint[]>();
  for (const point of points) {
    const day = point.at.slice(0, 10);
    const bucket = buckets.get(day) ?? [];
    bucket.push(point);
    buckets.set(day, bucket);
  }
  const averages: DayAverage[] = [];
  for (const [day, bucket] of buckets) {
    averages.push({ day, moisture: averageMoisture(bucket), count: bucket.length });
  }
  return averages.sort((first, second) => first.day.localeCompare(second.day));
}

export function driestDays(points: ReadingPoint[], count = 3): string[] {
  const averages = dailyAverages(points);
  averages.sort((first, second) => first.moisture - second.moisture);
  return averages.slice(0, count).map((average) => average.day);
}

export function weekOf(day: string): string {
  const date = new Date(`${day}T00:00:00Z`);
  const weekday = (date.getUTCDay() + 6) % 7;
  date.setUTCDate(date.getUTCDate() - weekday);
  return date.toISOString().slice(0, 10);
}

export function weeklyAverages(points: ReadingPoint[]): Map<string, number> {
  const weeks = new Map<string, number[]>();
  for (const average of dailyAverages(points)) {
    const week = weekOf(average.day);
    const moistures = weeks.get(week) ?? [];
    moistures.push(average.moisture);
    weeks.set(week, moistures);
  }
  const result = new Map<string, number>();
  for (const [week, moistures] of weeks) {
    const total = moistures.reduce((sum, moisture) => sum + moisture, 0);
    result.set(week, total / moistures.length);
  }
  return result;
}

export function renderHistory(container: HTMLElement, points: ReadingPoint[]): void {
  const list = document.createElement("ol");
  for (const average of dailyAverages(points)) {
    const item = document.createElement("li");
    item.textContent = `${average.day}: ${average.moisture.toFixed(1)}% (${average.count} readings)`;
    list.append(item);
  }
  container.replaceChildren(list);
}
