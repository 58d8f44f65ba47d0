export interface Zone {
  zoneId: string;
  name: string;
  crop: string;
  glasshouse: string;
  targetMoisture: number;
  moisture: number;
  litres: number;
  nextWatering: string | null;
  slots: string[];
}

export interface ReadingPoint {
  at: string;
  moisture: number;
  temperature: number;
  sensorId: string;
}

export interface Alert {
  level: "warning" | "critical";
  zone_id: string;
  message: string;
  raised_at: string;
}

export interface ZoneReadings {
  zoneId: string;
  points: ReadingPoint[];
}

export interface Summary {
  moistureByZone: Record<string, number>;
}
