export interface Column<T> {
  title: string;
  value: (row: T) => string | number;
  align?: "left" | "right";
}

export function compareValues(first: string | number, second: string | number): number {
  if (typeof first === "number" && typeof second === "number") {
    return first - second;
  }
  return String(first).localeCompare(String(second));
}

export function sortRows<T>(rows: T[], column: Column<T>, descending = false): T[] {
  const sorted = rows.slice().sort((first, second) => compareValues(column.value(first), column.value(second)));
  return descending ? sorted.reverse() : sorted;
}

export function renderTable<T>(container: HTMLElement, rows: T[], columns: Column<T>[]): void {
  const table = document.createElement("table");
  const head = table.createTHead().insertRow();
  for (const column of columns) {
    const cell = document.createElement("th");
    cell.textContent = column.title;
    head.append(cell);
  }
  const body = table.createTBody();
  for (const row of rows) {
    const tableRow = body.insertRow();
    for (const column of columns) {
      const cell = tableRow.insertCell();
      cell.textContent = String(column.value(row));
      cell.style.textAlign = column.align ?? "left";
    }
  }
  container.replaceChildren(table);
}

export function toCsv<T>(rows: T[], columns: Column<T>[]): string {
  const lines = [columns.map((column) => quote(column.title)).join(",")];
  for (const row of rows) {
    lines.push(columns.map((column) => quote(String(column.value(row)))).join(","));
  }
  return lines.join("\n");
}

function quote(text: string): string {
  return /[",\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function paginate<T>(rows: T[], page: number, pageSize: number): T[] {
  const start = page * pageSize;
  return rows.slice(start, start + pageSize);
}
