export interface Slot {
  zoneId: string;
  startTime: string;
  minutes: number;
  weekdays: number[];
}

export function parseSlot(text: string): Slot {
  const [zoneId, startTime, minutesText, daysText] = text.split(" ");
  const weekdays = daysText.split(",").map((day) => Number(day));
  return { zoneId, startTime, minutes: Number(minutesText), weekdays };
}

export function slotsForDay(slots: Slot[], weekday: number): Slot[] {
  return slots.filter((slot) => slot.weekdays.includes(weekday));
}

export function weeklyMinutes(slots: Slot[]): number {
  let total = 0;
  for (const slot of slots) {
    total += slot.minutes * slot.weekdays.length;
  }
  return total;
}

export function slotEnd(slot: Slot): string {
  const [hours, minutes] = slot.startTime.split(":").map((part) => Number(part));
  const end = hours * 60 + minutes + slot.minutes;
  const endHours = String(Math.floor(end / 60) % 24).padStart(2, "0");
  const endMinutes = String(end % 60).padStart(2, "0");
  return `${endHours}:${endMinutes}`;
}

export function overlaps(first: Slot, second: Slot): boolean {
  const sharedDays = first.weekdays.filter((day) => second.weekdays.includes(day));
  if (sharedDays.length === 0) {
    return false;
  }
  return first.startTime < slotEnd(second) && second.startTime < slotEnd(first);
}

export function renderSlots(container: HTMLElement, slots: Slot[]): void {
  const table = document.createElement("table");
  for (const slot of slots) {
    const row = table.insertRow();
    row.insertCell().textContent = slot.zoneId;
    row.insertCell().textContent = `${slot.startTime}–${slotEnd(slot)}`;
    row.insertCell().textContent = slot.weekdays.map((day) => DAY_NAMES[day]).join(" ");
  }
  container.replaceChildren(table);
}

const DAY_NAMES = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"];
