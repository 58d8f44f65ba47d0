import { Zone } from "./types";

export interface CropStage {
  name: string;
  days: number;
  targetMoisture: number;
}

export const CROP_STAGES: Record<string, CropStage[]> = {
  tomato: [
    { name: "seedling", days: 21, targetMoisture: 45 },
    { name: "vegetative", days: 35, targetMoisture: 40 },
    { name: "fruiting", days: 60, targetMoisture: 38 },
  ],
  basil: [
    { name: "seedling", days: 14, targetMoisture: 42 },
    { name: "harvest", days: 70, targetMoisture: 35 },
  ],
};

export function stageOn(crop: string, plantedOn: Date, day: Date): CropStage | null {
  const stages = CROP_STAGES[crop];
  if (!stages) {
    return null;
  }
  let elapsed = Math.floor((day.getTime() - plantedOn.getTime()) / 86400000);
  if (elapsed < 0) {
    return null;
  }
  for (const stage of stages) {
    if (elapsed < stage.days) {
      return stage;
    }
    elapsed -= stage.days;
  }
  return null;
}

export function seasonDays(crop: string): number {
  const stages = CROP_STAGES[crop] ?? [];
  let total = 0;
  for (const stage of stages) {
    total += stage.days;
  }
  return total;
}

export function harvestDate(crop: string, plantedOn: Date): Date {
  const harvest = new Date(plantedOn.getTime());
  harvest.setDate(harvest.getDate() + seasonDays(crop));
  return harvest;
}

export function cropCounts(zones: Zone[]): Map<string, number> {
  const counts = new Map<string, number>();
  for (const zone of zones) {
    counts.set(zone.crop, (counts.get(zone.crop) ?? 0) + 1);
  }
  return counts;
}

export function renderCrops(container: HTMLElement, zones: Zone[]): void {
  const list = document.createElement("ul");
  for (const [crop, count] of cropCounts(zones)) {
    const item = document.createElement("li");
    item.textContent = `${crop}: ${count} zone${count === 1 ? "" : "s"}`;
    list.append(item);
  }
  container.replaceChildren(list);
}
