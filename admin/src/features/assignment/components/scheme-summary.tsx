import { schemeMethodText } from './scheme-methods';
import type { SchemeMethod } from '../utils/scheme-settings';

function settingLines(settings: Record<string, unknown>): string[] {
  const lines: string[] = [];
  if (Array.isArray(settings.blockSizes)) lines.push(`Block sizes ${settings.blockSizes.join(', ')}`);
  if (typeof settings.measure === 'string') lines.push(`Imbalance measured by ${settings.measure}`);
  if (typeof settings.coinProbability === 'number') {
    lines.push(`Biased coin ${Math.abs(settings.coinProbability - 2 / 3) < 1e-12 ? '2/3' : settings.coinProbability}`);
  }
  if (typeof settings.pretestKey === 'string') lines.push(`Pairs matched on ${settings.pretestKey}`);
  if (Array.isArray(settings.squaresPerBlock))
    lines.push(
      `Blocks of ${settings.squaresPerBlock.join(' or ')} whole design${settings.squaresPerBlock.length === 1 && settings.squaresPerBlock[0] === 1 ? '' : 's'}`,
    );
  if (settings.stratify === true) lines.push('Stratified');
  return lines;
}

/** The saved scheme in words, for when it can no longer change. */
export function SchemeSummary({ method, settings }: { method: string | null; settings: Record<string, unknown> }) {
  if (!method) return <p className="text-sm text-ink-muted">No scheme was chosen.</p>;
  const text = schemeMethodText[method as SchemeMethod];
  const lines = settingLines(settings);
  return (
    <div className="flex flex-col gap-1">
      <p className="font-semibold">{text?.label ?? method}</p>
      {text && <p className="max-w-prose text-sm text-ink-muted">{text.explanation}</p>}
      {lines.length > 0 && <p className="text-sm">{lines.join(' · ')}</p>}
    </div>
  );
}
