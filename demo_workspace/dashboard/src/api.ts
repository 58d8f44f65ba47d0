import { Alert, Summary, Zone, ZoneReadings } from "./types";

const BASE_URL = "/api";

export class ApiError extends Error {
  constructor(public status: number, message: string) {
    super(message);
  }
}

async function getJson<T>(path: string): Promise<T> {
  const response = await fetch(`${BASE_URL}${path}`, { headers: { Accept: "application/json" } });
  if (!response.ok) {
    const text = await response.text();
    throw new ApiError(response.status, text || response.statusText);
  }
  const payload = (await response.json()) as T;
  return payload;
}

export async function fetchZones(): Promise<Zone[]> {
  const payload = await getJson<{ zones: Zone[] }>("/zones");
  return payload.zones;
}

export async function fetchZone(zoneId: string): Promise<Zone> {
  return getJson<Zone>(`/zones/${encodeURIComponent(zoneId)}`);
}

export async function fetchReadings(zoneId: string, hours = 24): Promise<ZoneReadings> {
  const query = new URLSearchParams({ hours: String(hours) });
  return getJson<ZoneReadings>(`/zones/${encodeURIComponent(zoneId)}/readings?${query}`);
}

export async function fetchAlerts(): Promise<Alert[]> {
  const payload = await getJson<{ alerts: Alert[] }>("/alerts");
  return payload.alerts;
}

export async function fetchSummary(): Promise<Summary> {
  return getJson<Summary>("/summary");
}

export async function fetchWithRetry<T>(load: () => Promise<T>, attempts = 3, delayMs = 500): Promise<T> {
  let lastError: unknown = null;
  for (let attempt = 0; attempt < attempts; attempt++) {
    try {
      return await load();
    } catch (error) {
      lastError = error;
      await new Promise((resolve) => setTimeout(resolve, delayMs * (attempt + 1)));
    }
  }
  throw lastError;
}
