import { ReadingPoint } from "./types";
import { formatTime } from "./format";

export interface ChartOptions {
  width: number;
  height: number;
  padding: number;
  lowest: number;
  highest: number;
}

export const DEFAULT_OPTIONS: ChartOptions = { width: 640, height: 240, padding: 24, lowest: 0, highest: 60 };

export function scaleX(index: number, count: number, options: ChartOptions): number {
  const usable = options.width - 2 * options.padding;
  return options.padding + (count > 1 ? (index / (count - 1)) * usable : usable / 2);
}

export function scaleY(moisture: number, options: ChartOptions): number {
  const usable = options.height - 2 * options.padding;
  const share = (moisture - options.lowest) / (options.highest - options.lowest || 1);
  return options.height - options.padding - share * usable;
}

export function linePath(points: ReadingPoint[], options: ChartOptions): string {
  const parts: string[] = [];
  points.forEach((point, index) => {
    const x = scaleX(index, points.length, options);
    const y = scaleY(point.moisture, options);
    parts.push(`${index === 0 ? "M" : "L"}${x.toFixed(1)},${y.toFixed(1)}`);
  });
  return parts.join(" ");
}

export function targetLine(targetMoisture: number, options: ChartOptions): string {
  const y = scaleY(targetMoisture, options);
  return `M${options.padding},${y.toFixed(1)} L${options.width - options.padding},${y.toFixed(1)}`;
}

export function tickLabels(points: ReadingPoint[], count: number): string[] {
  if (points.length === 0) {
    return [];
  }
  const labels: string[] = [];
  const step = Math.max(1, Math.floor(points.length / count));
  for (let index = 0; index < points.length; index += step) {
    labels.push(formatTime(points[index].at));
  }
  return labels;
}

export function renderChart(container: HTMLElement, points: ReadingPoint[], targetMoisture: number): void {
  const options = { ...DEFAULT_OPTIONS };
  const svg = document.createElementNS("http://www.w3.org/2000/svg", "svg");
  svg.setAttribute("viewBox", `0 0 ${options.width} ${options.height}`);
  const line = document.createElementNS("http://www.w3.org/2000/svg", "path");
  line.setAttribute("d", linePath(points, options));
  line.setAttribute("class", "moisture-line");
  const target = document.createElementNS("http://www.w3.org/2000/svg", "path");
  target.setAttribute("d", targetLine(targetMoisture, options));
  target.setAttribute("class", "target-line");
  svg.append(target, line);
  container.replaceChildren(svg);
}

export function sparkline(points: ReadingPoint[], width = 80, height = 20): string {
  const options = { width, height, padding: 2, lowest: 0, highest: 60 };
  return linePath(points, options);
}
