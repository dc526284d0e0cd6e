import { CartesianGrid, Legend, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { AttritionReport } from '../api/get-attrition-report';
import { toStepPoints } from '../utils/survival-steps';
import { formatShare, hazardRatioSentence, logRankSentence } from '../utils/watch-format';
import { formatMoment } from '@/lib/dates';

/** Follow-up is exact (fractions of a day); shown with two decimals. */
const formatDay = (day: number) => day.toFixed(2);

const palette = [
  'var(--color-spruce)',
  'var(--color-ochre)',
  'var(--color-danger)',
  'var(--color-success)',
  'var(--color-caution)',
  'var(--color-ink-muted)',
];
const dashes = [undefined, '6 3', '2 3', '8 3 2 3', '1 2', '4 4'];

export function DropoutCurves({ report }: { report: AttritionReport }) {
  const names = new Map(report.conditions.map((condition) => [condition.conditionId, condition.name]));
  const curves = report.survival.curves.map((curve, index) => ({
    id: curve.conditionId,
    name: `Condition ${names.get(curve.conditionId) ?? '?'}`,
    color: palette[index % palette.length]!,
    dash: dashes[index % dashes.length],
    steps: toStepPoints(curve.points),
    median: curve.median,
  }));
  const logRank = report.survival.logRank;
  const summary = curves
    .map(
      (curve) =>
        `${curve.name}: ${formatShare(curve.steps.at(-1)?.survival)} still in at day ${formatDay(curve.steps.at(-1)?.time ?? 0)}`,
    )
    .join('; ');

  return (
    <figure className="flex flex-col gap-2">
      <figcaption className="text-sm font-semibold">
        Share not dropped out, by days since assignment (Kaplan–Meier)
      </figcaption>
      <div
        role="img"
        aria-label={`Step chart of the share not dropped out per condition. ${summary}.`}
        className="h-72 w-full"
      >
        <ResponsiveContainer width="100%" height="100%">
          <LineChart margin={{ top: 8, right: 16, bottom: 16, left: 0 }}>
            <CartesianGrid stroke="var(--color-line)" strokeDasharray="3 3" />
            <XAxis
              type="number"
              dataKey="time"
              domain={[0, 'dataMax']}
              allowDecimals={false}
              tick={{ fontSize: 11, fill: 'var(--color-ink-muted)' }}
              label={{
                value: 'Days since assignment',
                position: 'insideBottom',
                offset: -10,
                fontSize: 11,
                fill: 'var(--color-ink-muted)',
              }}
            />
            <YAxis
              domain={[0, 1]}
              tickFormatter={(value: number) => `${Math.round(value * 100)}%`}
              tick={{ fontSize: 11, fill: 'var(--color-ink-muted)' }}
              width={42}
            />
            <Tooltip
              labelFormatter={(value) => `Day ${formatDay(Number(value))}`}
              formatter={(value) => formatShare(Number(value))}
              contentStyle={{ fontSize: 12, borderRadius: 5, borderColor: 'var(--color-line)' }}
            />
            <Legend verticalAlign="top" wrapperStyle={{ fontSize: 12 }} />
            {curves.map((curve) => (
              <Line
                key={curve.id}
                data={curve.steps}
                type="stepAfter"
                dataKey="survival"
                name={curve.name}
                stroke={curve.color}
                strokeDasharray={curve.dash}
                strokeWidth={2}
                dot={false}
                isAnimationActive={false}
              />
            ))}
          </LineChart>
        </ResponsiveContainer>
      </div>
      <p className="text-sm text-ink" data-testid="log-rank">
        {logRankSentence(logRank)}{' '}
        {logRank.groups.length > 0 &&
          `Dropouts observed vs expected: ${logRank.groups.map((group) => `${names.get(group.conditionId) ?? '?'} ${group.observed} vs ${group.expected.toFixed(1)}`).join(', ')}.`}
      </p>
      <p className="text-sm text-ink" data-testid="median-dropout">
        Median time to dropout:{' '}
        {curves
          .map(
            (curve) =>
              `${curve.name} ${curve.median === null ? 'not reached (fewer than half dropped out)' : `${formatDay(curve.median)} days`}`,
          )
          .join('; ')}
        .
      </p>
      <div className="text-sm text-ink" data-testid="hazard-ratios">
        <p>
          Cox proportional-hazards model, each condition against condition{' '}
          {names.get(report.survival.cox.comparisonConditionId) ?? '?'} (hazard of dropping out; above 1 means people
          leave sooner):
        </p>
        <ul className="list-disc pl-5">
          {report.survival.cox.hazardRatios.map((ratio) => (
            <li key={ratio.conditionId}>
              {hazardRatioSentence(
                ratio,
                names.get(ratio.conditionId) ?? '?',
                names.get(report.survival.cox.comparisonConditionId) ?? '?',
              )}
            </li>
          ))}
        </ul>
        <p className="text-xs text-ink-muted">
          Fitted by Newton–Raphson on the partial likelihood; tied dropout times use{' '}
          {report.survival.cox.ties === 'efron' ? "Efron's" : "Breslow's"} method; 95% Wald intervals on the log scale.
          It assumes the ratio stays the same over time: when the curves cross, read the curves instead.
        </p>
      </div>
      <p className="text-xs text-ink-muted">
        Follow-up times are exact (fractions of a day), not rounded to whole days. Completers are censored at
        completion, active participants at {formatMoment(report.survival.censoredAt)}. Bands (
        {Math.round((report.survival.curves[0]?.confidenceLevel ?? 0.95) * 100)}%, Greenwood) are listed in the table
        below.
      </p>
      <details className="text-sm">
        <summary className="cursor-pointer font-medium text-spruce-ink">Curve values as a table</summary>
        {curves.map((curve) => (
          <table key={curve.id} className="mt-2 w-full max-w-xl text-xs">
            <caption className="text-left font-semibold">{curve.name}</caption>
            <thead>
              <tr className="text-ink-muted">
                <th scope="col" className="text-left">
                  Day
                </th>
                <th scope="col" className="text-right">
                  At risk
                </th>
                <th scope="col" className="text-right">
                  Dropouts
                </th>
                <th scope="col" className="text-right">
                  Still in
                </th>
                <th scope="col" className="text-right">
                  95% band
                </th>
              </tr>
            </thead>
            <tbody>
              {curve.steps.map((step, index) => (
                <tr key={index}>
                  <td className="tabular-nums">{formatDay(step.time)}</td>
                  <td className="text-right tabular-nums">{step.atRisk ?? '—'}</td>
                  <td className="text-right tabular-nums">{step.events}</td>
                  <td className="text-right tabular-nums">{formatShare(step.survival)}</td>
                  <td className="text-right tabular-nums">
                    {step.lower === null || step.upper === null
                      ? '—'
                      : `${formatShare(step.lower)}–${formatShare(step.upper)}`}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        ))}
      </details>
    </figure>
  );
}
