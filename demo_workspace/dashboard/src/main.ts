import { fetchAlerts, fetchReadings, fetchWithRetry, fetchZones } from "./api";
import { renderAlerts } from "./alerts";
import { renderChart } from "./charts";
import { formatDeficit, formatLitres, formatMoisture } from "./format";
import { dropOutliers } from "./readings";
import { initialState, Store } from "./store";
import { Zone } from "./types";
import { findZone, searchZones, sortZones } from "./zones";

const REFRESH_MS = 60000;

function renderZoneRow(zone: Zone, store: Store): HTMLTableRowElement {
  const row = document.createElement("tr");
  row.className = zone.moisture < zone.targetMoisture ? "zone dry" : "zone";
  row.insertCell().textContent = zone.name;
  row.insertCell().textContent = zone.crop;
  row.insertCell().textContent = formatMoisture(zone.moisture);
  row.insertCell().textContent = formatDeficit(zone.moisture, zone.targetMoisture);
  row.insertCell().textContent = formatLitres(zone.litres);
  row.addEventListener("click", () => store.selectZone(zone.zoneId));
  return row;
}

function renderZoneTable(container: HTMLElement, zones: Zone[], store: Store): void {
  const table = document.createElement("table");
  const body = table.createTBody();
  for (const zone of zones) {
    body.append(renderZoneRow(zone, store));
  }
  container.replaceChildren(table);
}

async function showZone(container: HTMLElement, zone: Zone): Promise<void> {
  const readings = await fetchReadings(zone.zoneId, 48);
  const points = dropOutliers(readings.points);
  renderChart(container, points, zone.targetMoisture);
}

async function refresh(store: Store): Promise<void> {
  try {
    const zones = await fetchWithRetry(fetchZones);
    const alerts = await fetchWithRetry(fetchAlerts);
    store.setZones(zones);
    store.update({ alerts });
  } catch (error) {
    store.setError(error instanceof Error ? error.message : String(error));
  }
}

export function start(root: HTMLElement): void {
  const store = new Store(initialState());
  const tableContainer = root.querySelector<HTMLElement>("#zones")!;
  const chartContainer = root.querySelector<HTMLElement>("#chart")!;
  const alertContainer = root.querySelector<HTMLElement>("#alerts")!;
  const search = root.querySelector<HTMLInputElement>("#search")!;
  search.addEventListener("input", () => store.update({ query: search.value }));
  store.subscribe((state) => {
    const visible = sortZones(searchZones(state.zones, state.query), state.sortKey);
    renderZoneTable(tableContainer, visible, store);
    renderAlerts(alertContainer, state.alerts);
    const selected = state.selectedZoneId ? findZone(state.zones, state.selectedZoneId) : undefined;
    if (selected) {
      void showZone(chartContainer, selected);
    }
  });
  void refresh(store);
  setInterval(() => void refresh(store), REFRESH_MS);
}
