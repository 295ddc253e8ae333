// Lifetime cycles over time from the counter readings, with services marked where they happened.
// Lifetime rather than the raw counter, so a replaced controller does not show as a cliff.
import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { ReadingView, ServiceEventView } from '@/shared/schemas/assets';
import { palette } from '../../../../tailwind.config';
import { longDate } from '../utils/format';
import { formatMonth, formatNumber } from '@/lib/format';

const time = (d: string) => Date.parse(`${d}T12:00:00Z`);

export function CounterChart({ readings, events }: { readings: ReadingView[]; events: ServiceEventView[] }) {
  const data = readings.map((r) => ({ t: time(r.readOn), millions: r.lifetime / 1e6, reset: r.counterReset }));
  if (data.length < 2) return null;
  const first = data[0].t;
  const last = data[data.length - 1].t;
  // First days of months inside the range, thinned to about six, so no month shows twice.
  const months: number[] = [];
  for (let d = new Date(first); d.getTime() <= last; d = new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth() + 1, 1))) {
    const start = Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), 1);
    if (start >= first) months.push(start);
  }
  const step = Math.max(1, Math.ceil(months.length / 6));
  const ticks = months.filter((_, i) => i % step === 0);
  return (
    <figure className="mt-3">
      <div
        className="h-56 w-full"
        role="img"
        aria-label={`Lifetime cycles from ${longDate(readings[0].readOn)} to ${longDate(readings[readings.length - 1].readOn)}, rising to ${formatNumber(data[data.length - 1].millions, { maximumFractionDigits: 1 })} million cycles`}
      >
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 8, right: 12, bottom: 4, left: 0 }}>
            <CartesianGrid stroke={palette.rule.DEFAULT} strokeDasharray="3 3" />
            <XAxis
              dataKey="t"
              type="number"
              scale="time"
              domain={[first, last]}
              ticks={ticks}
              tickFormatter={(t: number) => formatMonth(new Date(t), { timeZone: 'UTC' })}
              stroke={palette.ink.soft}
              fontSize={12}
              minTickGap={24}
            />
            <YAxis width={56} stroke={palette.ink.soft} fontSize={12} tickFormatter={(v: number) => `${formatNumber(v, { maximumFractionDigits: 1 })} M`} />
            <Tooltip
              labelFormatter={(t) => longDate(new Date(Number(t)).toISOString().slice(0, 10))}
              formatter={(v) => [`${formatNumber(Number(v), { maximumFractionDigits: 2 })} million cycles`, 'Lifetime']}
            />
            {events
              .filter((e) => time(e.performedOn) >= first && time(e.performedOn) <= last)
              .map((e) => (
                <ReferenceLine key={e.id} x={time(e.performedOn)} stroke={palette.fixed.DEFAULT} strokeDasharray="4 3" />
              ))}
            <Line type="monotone" dataKey="millions" stroke={palette.amber.DEFAULT} strokeWidth={2} dot={{ r: 3 }} isAnimationActive={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-1 text-sm text-ink-soft">Cycles since installation in millions (M), carried across counter resets. Dashed green lines mark services.</figcaption>
    </figure>
  );
}
