import type { AttritionReport } from '../api/get-attrition-report';
import { stratifiedSentences, stratumLabel } from '../utils/watch-format';

/** Dropout tests within the randomization strata (Cochran–Mantel–Haenszel and stratified log-rank), strata named. */
export function StratifiedTests({ report }: { report: AttritionReport }) {
  const stratified = report.stratified;
  const names = new Map(report.conditions.map((condition) => [condition.conditionId, condition.name]));
  const sentences = stratifiedSentences(stratified);
  return (
    <div className="flex flex-col gap-2 text-sm">
      {stratified.stratified && (
        <div>
          <p className="font-semibold">Strata ({stratified.strata.length}), as recorded at randomization:</p>
          <ul aria-label="Randomization strata" className="mt-1 flex flex-wrap gap-1.5">
            {stratified.strata.map((stratum) => (
              <li key={stratum} className="rounded border border-line bg-sunken px-2 py-0.5 text-xs">
                {stratumLabel(stratum)}
              </li>
            ))}
          </ul>
        </div>
      )}
      <ul className="flex flex-col gap-1" data-testid="stratified-tests">
        {sentences.map((sentence) => (
          <li key={sentence}>{sentence}</li>
        ))}
      </ul>
      {stratified.logRank && stratified.logRank.statistic !== null && (
        <p className="text-ink">
          Dropouts observed vs expected within strata:{' '}
          {stratified.logRank.groups
            .map((group) => `${names.get(group.conditionId) ?? '?'} ${group.observed} vs ${group.expected.toFixed(1)}`)
            .join(', ')}
          .
        </p>
      )}
      <p className="text-xs text-ink-muted">
        Both tests compare the conditions within each stratum and then combine the strata, so a difference that comes
        only from a different mix of strata does not count. They count people still active the same way as every other
        panel. Screening aids, not the study&apos;s analysis.
      </p>
    </div>
  );
}
