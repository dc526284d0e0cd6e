import {
  BETWEEN_METHODS,
  DEFAULT_COIN_PROBABILITY,
  MAX_BLOCK_SIZE,
  MAX_SQUARES_PER_BLOCK,
  WITHIN_DESIGNS,
  blockSizeMultipleProblem,
  conditionCountProblem,
  isCoinProbability,
  isWithinMethod,
  totalWeight,
  type SchemeMethod,
} from '@evenhand/contract/schemas';
import { parseWholeNumberList } from '@/lib/number-list';

// The rules themselves (limits, which sizes hold a ratio, how many conditions each design takes) are the contract's,
// the same the api checks with; this file only words them for the form and puts each on its field.
export { totalWeight, type SchemeMethod };

export const betweenMethods: readonly SchemeMethod[] = BETWEEN_METHODS;
export const withinMethods: readonly SchemeMethod[] = WITHIN_DESIGNS;

export function methodsFor(design: 'between' | 'within'): readonly SchemeMethod[] {
  return design === 'between' ? betweenMethods : withinMethods;
}

/** The researcher's choices as the api takes them (PUT …/assignment-scheme without `method`). */
export type SchemeSettings = {
  blockSizes?: number[];
  measure?: 'range' | 'variance';
  coinProbability?: number;
  pretestKey?: string;
  squaresPerBlock?: number[];
  stratify?: boolean;
};

/** What the scheme form edits: numbers stay text until they are checked. */
export interface SchemeFormValues {
  method?: SchemeMethod | undefined;
  blockSizes: string;
  measure: 'range' | 'variance';
  coinProbability: string;
  pretestKey: string;
  squaresPerBlock: string;
  stratify: boolean;
}

/** What the design around the scheme looks like; the api builds the full parameters from it. */
export interface SchemeContext {
  design: 'between' | 'within';
  conditionWeights: readonly number[];
  factors: readonly { key: string; kind: 'numeric' | 'categorical' }[];
}

export interface SettingsIssue {
  path: keyof SchemeFormValues;
  message: string;
}

// The contract's DEFAULT_COIN_PROBABILITY (Efron's biased coin, 2/3), as the form shows it.
export const defaultCoinProbabilityText = '2/3';

/**
 * A block must hold every condition in its exact ratio, so its size is a multiple of the total weight: with weights
 * 1 : 1 : 1 the sizes 3, 6, 9 work and 4 does not (the contract's blockSizeMultipleProblem, worded for the form).
 */
export function blockSizeProblem(sizes: readonly number[], weights: readonly number[]): string | null {
  const total = totalWeight(weights);
  const seen = new Set<number>();
  for (const size of sizes) {
    if (size > MAX_BLOCK_SIZE)
      return `${size} is too large; use block sizes up to ${MAX_BLOCK_SIZE.toLocaleString('en-US')}.`;
    if (blockSizeMultipleProblem(size, weights) !== null) {
      return `${size} is not a multiple of the total weight ${total} (${weights.join(' + ')}). A block must hold every condition in its ratio, so use ${[1, 2, 3].map((m) => m * total).join(', ')}, …`;
    }
    if (seen.has(size)) return `${size} is listed twice; list each size once.`;
    seen.add(size);
  }
  return null;
}

/** Reads "2/3", "0.667" or "1" into a probability; null when it is not a number. */
export function parseProbability(text: string): number | null {
  const trimmed = text.trim();
  const fraction = /^(\d+)\s*\/\s*(\d+)$/.exec(trimmed);
  if (fraction) {
    const denominator = Number(fraction[2]);
    return denominator === 0 ? null : Number(fraction[1]) / denominator;
  }
  if (!/^(\d+(\.\d*)?|\.\d+)$/.test(trimmed)) return null;
  return Number(trimmed);
}

/** Every problem with the chosen method and its settings, each on the field it belongs to. */
export function checkSchemeSettings(values: SchemeFormValues, context: SchemeContext): SettingsIssue[] {
  const issues: SettingsIssue[] = [];
  const method = values.method;
  if (!method) return [{ path: 'method', message: 'Choose how participants are assigned.' }];
  if (!methodsFor(context.design).includes(method)) {
    return [
      {
        path: 'method',
        message:
          context.design === 'between'
            ? 'This method hands out orders; the study is between-subjects.'
            : 'A within-subjects study hands out orders: choose counterbalanced, Latin square or Williams.',
      },
    ];
  }
  const conditionCount = context.conditionWeights.length;
  const factorCount = context.factors.length;

  if (context.design === 'between' && conditionCount < 2)
    issues.push({ path: 'method', message: 'Add at least two conditions first.' });

  if (method === 'permuted-blocks' || method === 'stratified-blocks') {
    const sizes = parseWholeNumberList(values.blockSizes);
    const problem = sizes.ok
      ? conditionCount > 0
        ? blockSizeProblem(sizes.values, context.conditionWeights)
        : null
      : sizes.message;
    if (problem) issues.push({ path: 'blockSizes', message: problem });
  }
  if ((method === 'stratified-blocks' || method === 'minimization') && factorCount === 0) {
    issues.push({
      path: 'method',
      message: 'This method balances within stratification factors: add at least one factor first.',
    });
  }
  if (method === 'minimization') {
    const p = parseProbability(values.coinProbability);
    if (p === null || !isCoinProbability(p)) {
      issues.push({
        path: 'coinProbability',
        message:
          'Enter a probability from 0.5 (a fair coin, ignoring imbalance) to 1 (always the least-imbalanced condition), e.g. 2/3.',
      });
    }
  }
  if (method === 'matched-pairs') {
    if (conditionCountProblem(method, conditionCount) !== null)
      issues.push({
        path: 'method',
        message: `Matched pairs need exactly two conditions (this study has ${conditionCount}).`,
      });
    else if (context.conditionWeights[0] !== context.conditionWeights[1])
      issues.push({
        path: 'method',
        message: 'Matched pairs split each pair 1 : 1, so both conditions need the same weight.',
      });
    const pretest = context.factors.find((factor) => factor.key === values.pretestKey);
    if (!pretest || pretest.kind !== 'numeric') {
      issues.push({
        path: 'pretestKey',
        message: context.factors.some((factor) => factor.kind === 'numeric')
          ? 'Choose the numeric pretest to pair people on.'
          : 'Add a numeric pretest as a stratification factor first.',
      });
    }
  }
  const withinCountProblem = isWithinMethod(method) && conditionCountProblem(method, conditionCount) !== null;
  if (method === 'counterbalanced' && withinCountProblem) {
    issues.push({
      path: 'method',
      message: `AB/BA counterbalancing needs exactly two conditions (this study has ${conditionCount}); use a Latin square or Williams design for three or more.`,
    });
  }
  if ((method === 'latin-square' || method === 'williams') && withinCountProblem) {
    issues.push({
      path: 'method',
      message: `This design needs at least three conditions (this study has ${conditionCount}); use counterbalancing for two.`,
    });
  }
  if (isWithinMethod(method)) {
    const squares = parseWholeNumberList(values.squaresPerBlock);
    if (!squares.ok) issues.push({ path: 'squaresPerBlock', message: squares.message });
    else if (squares.values.some((count) => count > MAX_SQUARES_PER_BLOCK))
      issues.push({
        path: 'squaresPerBlock',
        message: `Use at most ${MAX_SQUARES_PER_BLOCK} copies of the design per block.`,
      });
    else if (new Set(squares.values).size !== squares.values.length)
      issues.push({ path: 'squaresPerBlock', message: 'A size is listed twice; list each once.' });
    if (values.stratify && factorCount === 0)
      issues.push({ path: 'stratify', message: 'There are no stratification factors to stratify by.' });
  }
  return issues;
}

/** The settings the api takes for the chosen method; call only after checkSchemeSettings found nothing. */
export function toSchemeSettings(values: SchemeFormValues): SchemeSettings {
  const whole = (text: string) => {
    const list = parseWholeNumberList(text);
    return list.ok ? list.values : [];
  };
  switch (values.method) {
    case 'permuted-blocks':
    case 'stratified-blocks':
      return { blockSizes: whole(values.blockSizes) };
    case 'minimization':
      return {
        measure: values.measure,
        coinProbability: parseProbability(values.coinProbability) ?? DEFAULT_COIN_PROBABILITY,
      };
    case 'matched-pairs':
      return { pretestKey: values.pretestKey };
    case 'counterbalanced':
    case 'latin-square':
    case 'williams':
      return { squaresPerBlock: whole(values.squaresPerBlock), stratify: values.stratify };
    default:
      return {};
  }
}

function probabilityText(p: number | undefined): string {
  if (p === undefined || Math.abs(p - DEFAULT_COIN_PROBABILITY) < 1e-12) return defaultCoinProbabilityText;
  return String(p);
}

/** Form values from what is saved (GET …/assignment `method` and `settings`), with sensible starting values. */
export function schemeFormValuesFrom(
  method: string | null,
  settings: Record<string, unknown>,
  context: SchemeContext,
): SchemeFormValues {
  const list = (value: unknown) => (Array.isArray(value) ? value.join(', ') : '');
  const total = totalWeight(context.conditionWeights);
  const firstNumeric = context.factors.find((factor) => factor.kind === 'numeric')?.key ?? '';
  return {
    method:
      method && methodsFor(context.design).includes(method as SchemeMethod) ? (method as SchemeMethod) : undefined,
    blockSizes: list(settings.blockSizes) || (total > 0 ? `${total}, ${total * 2}` : ''),
    measure: settings.measure === 'variance' ? 'variance' : 'range',
    coinProbability: probabilityText(
      typeof settings.coinProbability === 'number' ? settings.coinProbability : undefined,
    ),
    pretestKey: typeof settings.pretestKey === 'string' ? settings.pretestKey : firstNumeric,
    squaresPerBlock: list(settings.squaresPerBlock) || '1',
    stratify: settings.stratify === true,
  };
}
