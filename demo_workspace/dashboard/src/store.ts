import { Alert, Zone } from "./types";

export interface DashboardState {
  zones: Zone[];
  alerts: Alert[];
  selectedZoneId: string | null;
  sortKey: "name" | "moisture" | "litres";
  query: string;
  loading: boolean;
  error: string | null;
}

type Listener = (state: DashboardState) => void;

export class Store {
  private state: DashboardState;
  private listeners: Listener[] = [];

  constructor(initial: DashboardState) {
    this.state = initial;
  }

  get current(): DashboardState {
    return this.state;
  }

  subscribe(listener: Listener): () => void {
    this.listeners.push(listener);
    return () => {
      this.listeners = this.listeners.filter((other) => other !== listener);
    };
  }

  update(changes: Partial<DashboardState>): void {
    this.state = { ...this.state, ...changes };
    for (const listener of this.listeners) {
      listener(this.state);
    }
  }

  selectZone(zoneId: string | null): void {
    this.update({ selectedZoneId: zoneId });
  }

  setZones(zones: Zone[]): void {
    const selectedZoneId = zones.some((zone) => zone.zoneId === this.state.selectedZoneId)
      ? this.state.selectedZoneId
      : null;
    this.update({ zones, selectedZoneId, loading: false, error: null });
  }

  setError(error: string): void {
    this.update({ error, loading: false });
  }
}

export function initialState(): DashboardState {
  return { zones: [], alerts: [], selectedZoneId: null, sortKey: "name", query: "", loading: true, error: null };
}
