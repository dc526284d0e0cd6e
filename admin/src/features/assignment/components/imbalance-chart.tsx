import { CartesianGrid, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { DryRunImbalancePoint } from '../api/run-dry-run';
import { formatImbalance } from './balance-table';

export interface ImbalanceChartProps {
  points: readonly DryRunImbalancePoint[];
  showFactorLevels: boolean;
  showStrata: boolean;
}

const lines = [
  { key: 'overall', name: 'All participants', color: 'var(--color-spruce)', dash: undefined },
  { key: 'largestInStratum', name: 'Worst stratum', color: 'var(--color-ochre)', dash: '5 3' },
  { key: 'largestInFactorLevel', name: 'Worst factor level', color: 'var(--color-danger)', dash: '2 3' },
] as const;

/** The largest imbalance reached in each stretch of arrivals; a text summary stands in for screen readers. */
export function ImbalanceChart({ points, showFactorLevels, showStrata }: ImbalanceChartProps) {
  const shown = lines.filter((line) =>
    line.key === 'largestInFactorLevel' ? showFactorLevels : line.key === 'largestInStratum' ? showStrata : true,
  );
  const peak = (key: (typeof lines)[number]['key']) => points.reduce((max, point) => Math.max(max, point[key]), 0);
  const summary = shown.map((line) => `${line.name}: at most ${formatImbalance(peak(line.key))}`).join('; ');

  return (
    <figure className="flex flex-col gap-2">
      <figcaption className="text-sm font-semibold">Largest imbalance as arrivals come in</figcaption>
      <div
        role="img"
        aria-label={`Line chart of the largest imbalance over ${points.at(-1)?.arrivals.toLocaleString() ?? 0} arrivals. ${summary}.`}
        className="h-64 w-full"
      >
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={points as DryRunImbalancePoint[]} margin={{ top: 8, right: 16, bottom: 4, left: 0 }}>
            <CartesianGrid stroke="var(--color-line)" strokeDasharray="3 3" />
            <XAxis
              dataKey="arrivals"
              minTickGap={28}
              tick={{ fontSize: 11, fill: 'var(--color-ink-muted)' }}
              tickFormatter={(value: number) => value.toLocaleString()}
            />
            <YAxis allowDecimals={false} tick={{ fontSize: 11, fill: 'var(--color-ink-muted)' }} width={36} />
            <Tooltip
              labelFormatter={(value) => `After ${Number(value).toLocaleString()} arrivals`}
              formatter={(value) => formatImbalance(Number(value))}
              contentStyle={{ fontSize: 12, borderRadius: 5, borderColor: 'var(--color-line)' }}
            />
            <Legend wrapperStyle={{ fontSize: 12 }} />
            {shown.map((line) => (
              <Line
                key={line.key}
                type="stepAfter"
                dataKey={line.key}
                name={line.name}
                stroke={line.color}
                strokeWidth={1.75}
                strokeDasharray={line.dash}
                dot={false}
                isAnimationActive={false}
              />
            ))}
          </LineChart>
        </ResponsiveContainer>
      </div>
      <p className="text-xs text-ink-muted">
        Imbalance is the largest difference in counts between two conditions (scaled by their weights), taken over the
        worst group at each point. Blocks keep it small and bounded; simple randomization lets it wander.
      </p>
    </figure>
  );
}
