// The service forecast as a spreadsheet: one line per coming service, then the parts to order.
import { csvCell as cell } from '../../../src/shared/csv-safe';
import type { ForecastAnswer } from '../../../src/shared/schemas/insights';

export function forecastCsv(a: ForecastAnswer): string {
  const lines = [['tag', 'site', 'line', 'part', 'due_on', 'days_remaining', 'status', 'cycles_since', 'interval_cycles', 'parts'].join(',')];
  for (const r of a.rows) {
    const parts = r.partsKnown ? r.parts.map((p) => `${p.quantity} x ${p.name}${p.partNumber ? ` (${p.partNumber})` : ''}`).join('; ') : 'none known';
    lines.push([r.tag, r.site, r.line, r.part, r.dueOn, r.daysRemaining, r.status, r.cyclesSince, r.threshold, parts].map(cell).join(','));
  }
  lines.push('');
  lines.push(['part_number', 'part', 'quantity', 'applicators'].join(','));
  for (const p of a.partsToOrder) lines.push([p.partNumber, p.name, p.quantity, p.applicators].map(cell).join(','));
  return `${lines.join('\r\n')}\r\n`;
}
