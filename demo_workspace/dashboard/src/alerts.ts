import { Alert } from "./types";
import { formatTime } from "./format";

const LEVEL_ORDER: Record<string, number> = { critical: 0, warning: 1 };

export function worstFirst(alerts: Alert[]): Alert[] {
  return alerts
    .slice()
    .sort((first, second) => (LEVEL_ORDER[first.level] ?? 2) - (LEVEL_ORDER[second.level] ?? 2));
}

export function alertsForZone(alerts: Alert[], zoneId: string): Alert[] {
  return alerts.filter((alert) => alert.zone_id === zoneId);
}

export function countByLevel(alerts: Alert[]): Record<string, number> {
  const counts: Record<string, number> = {};
  for (const alert of alerts) {
    counts[alert.level] = (counts[alert.level] ?? 0) + 1;
  }
  return counts;
}

export function renderAlert(alert: Alert): HTMLElement {
  const element = document.createElement("li");
  element.className = `alert alert-${alert.level}`;
  const time = document.createElement("time");
  time.textContent = formatTime(alert.raised_at);
  const message = document.createElement("span");
  message.textContent = ` zone ${alert.zone_id}: ${alert.message}`;
  element.append(time, message);
  return element;
}

export function renderAlerts(container: HTMLElement, alerts: Alert[]): void {
  container.replaceChildren();
  if (alerts.length === 0) {
    const empty = document.createElement("p");
    empty.textContent = "No alerts. Every zone is on target.";
    container.append(empty);
    return;
  }
  const list = document.createElement("ul");
  for (const alert of worstFirst(alerts)) {
    list.append(renderAlert(alert));
  }
  container.append(list);
}

export function newAlerts(previous: Alert[], current: Alert[]): Alert[] {
  const seen = new Set(previous.map((alert) => `${alert.zone_id}|${alert.message}`));
  return current.filter((alert) => !seen.has(`${alert.zone_id}|${alert.message}`));
}
