export function formatMoisture(moisture: number): string {
  return `${moisture.toFixed(1)}%`;
}

export function formatLitres(litres: number): string {
  if (litres >= 1000) {
    return `${(litres / 1000).toFixed(2)} m³`;
  }
  return `${litres.toFixed(1)} l`;
}

export function formatTemperature(temperature: number): string {
  return `${temperature.toFixed(1)} °C`;
}

export function formatTime(at: string): string {
  const date = new Date(at);
  const hours = String(date.getHours()).padStart(2, "0");
  const minutes = String(date.getMinutes()).padStart(2, "0");
  return `${hours}:${minutes}`;
}

export function formatDay(at: string): string {
  const date = new Date(at);
  return date.toLocaleDateString("en-GB", { weekday: "short", day: "numeric", month: "short" });
}

export function formatDeficit(moisture: number, targetMoisture: number): string {
  const deficit = targetMoisture - moisture;
  if (deficit <= 0) {
    return "on target";
  }
  return `${deficit.toFixed(1)} points dry`;
}

export function formatRelative(at: string, now: Date): string {
  const date = new Date(at);
  const minutes = Math.round((date.getTime() - now.getTime()) / 60000);
  if (minutes < 0) {
    return `${-minutes} min ago`;
  }
  if (minutes < 60) {
    return `in ${minutes} min`;
  }
  const hours = Math.round(minutes / 60);
  return `in ${hours} h`;
}

export function pluralise(count: number, word: string): string {
  return count === 1 ? `${count} ${word}` : `${count} ${word}s`;
}
