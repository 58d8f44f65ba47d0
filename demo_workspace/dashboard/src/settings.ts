export interface DashboardSettings {
  refreshSeconds: number;
  hoursShown: number;
  units: "metric" | "imperial";
  glasshouse: string | null;
}

const STORAGE_KEY = "fernhill.settings";

export const DEFAULT_SETTINGS: DashboardSettings = {
  refreshSeconds: 60,
  hoursShown: 24,
  units: "metric",
  glasshouse: null,
};

export function loadSettings(storage: Storage): DashboardSettings {
  const text = storage.getItem(STORAGE_KEY);
  if (!text) {
    return { ...DEFAULT_SETTINGS };
  }
  try {
    const saved = JSON.parse(text) as Partial<DashboardSettings>;
    return validateSettings({ ...DEFAULT_SETTINGS, ...saved });
  } catch {
    return { ...DEFAULT_SETTINGS };
  }
}

export function saveSettings(storage: Storage, settings: DashboardSettings): void {
  storage.setItem(STORAGE_KEY, JSON.stringify(validateSettings(settings)));
}

export function validateSettings(settings: DashboardSettings): DashboardSettings {
  const refreshSeconds = Math.min(Math.max(settings.refreshSeconds, 10), 3600);
  const hoursShown = Math.min(Math.max(settings.hoursShown, 1), 24 * 14);
  const units = settings.units === "imperial" ? "imperial" : "metric";
  return { ...settings, refreshSeconds, hoursShown, units };
}

export function litresToGallons(litres: number): number {
  return litres / 3.785411784;
}

export function celsiusToFahrenheit(temperature: number): number {
  return temperature * 1.8 + 32;
}

export function bindSettingsForm(form: HTMLFormElement, storage: Storage, onChange: (settings: DashboardSettings) => void): void {
  const settings = loadSettings(storage);
  const refreshInput = form.querySelector<HTMLInputElement>("[name=refreshSeconds]")!;
  const hoursInput = form.querySelector<HTMLInputElement>("[name=hoursShown]")!;
  refreshInput.value = String(settings.refreshSeconds);
  hoursInput.value = String(settings.hoursShown);
  form.addEventListener("submit", (event) => {
    event.preventDefault();
    const updated = validateSettings({
      ...settings,
      refreshSeconds: Number(refreshInput.value),
      hoursShown: Number(hoursInput.value),
    });
    saveSettings(storage, updated);
    onChange(updated);
  });
}
