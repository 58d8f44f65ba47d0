import { Zone } from "./types";

export function zonesInGlasshouse(zones: Zone[], glasshouse: string): Zone[] {
  return zones.filter((zone) => zone.glasshouse === glasshouse);
}

export function glasshouses(zones: Zone[]): string[] {
  const names = new Set<string>();
  for (const zone of zones) {
    names.add(zone.glasshouse);
  }
  return Array.from(names).sort();
}

export function findZone(zones: Zone[], zoneId: string): Zone | undefined {
  return zones.find((zone) => zone.zoneId === zoneId);
}

export function thirstyZones(zones: Zone[]): Zone[] {
  const thirsty: Zone[] = [];
  for (const zone of zones) {
    if (zone.moisture < zone.targetMoisture) {
      thirsty.push(zone);
    }
  }
  return thirsty.sort((first, second) => deficit(second) - deficit(first));
}

export function deficit(zone: Zone): number {
  return Math.max(zone.targetMoisture - zone.moisture, 0);
}

export function totalLitres(zones: Zone[]): number {
  let total = 0;
  for (const zone of zones) {
    total += zone.litres;
  }
  return total;
}

export function zonesByCrop(zones: Zone[]): Map<string, Zone[]> {
  const groups = new Map<string, Zone[]>();
  for (const zone of zones) {
    const group = groups.get(zone.crop) ?? [];
    group.push(zone);
    groups.set(zone.crop, group);
  }
  return groups;
}

export function sortZones(zones: Zone[], key: "name" | "moisture" | "litres"): Zone[] {
  const sorted = zones.slice();
  if (key === "name") {
    sorted.sort((first, second) => first.name.localeCompare(second.name));
  } else if (key === "moisture") {
    sorted.sort((first, second) => first.moisture - second.moisture);
  } else {
    sorted.sort((first, second) => second.litres - first.litres);
  }
  return sorted;
}

export function nextWatering(zones: Zone[]): Zone | null {
  let soonest: Zone | null = null;
  for (const zone of zones) {
    if (zone.nextWatering === null) {
      continue;
    }
    if (soonest === null || zone.nextWatering < (soonest.nextWatering ?? "")) {
      soonest = zone;
    }
  }
  return soonest;
}

export function searchZones(zones: Zone[], query: string): Zone[] {
  const needle = query.trim().toLowerCase();
  if (!needle) {
    return zones;
  }
  return zones.filter(
    (zone) => zone.name.toLowerCase().includes(needle) || zone.crop.toLowerCase().includes(needle),
  );
}
