// Numbers as short label text (plot labels, event notes): up to `decimals` decimals, trailing
// zeros dropped, a true minus sign. Shared by the report's plots and the scenario's event notes.

export function label(value: number, decimals = 2): string {
  const text = Number(value.toFixed(decimals)).toString();
  return text.startsWith('-') ? `−${text.slice(1)}` : text;
}
