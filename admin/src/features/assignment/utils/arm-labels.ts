/** A condition as the assignment screens name it: its neutral code, and its name when the study team may see it. */
export interface ArmCondition {
  id: string;
  code: string;
  internalName: string | null;
  allocationWeight: number;
}

/**
 * The order of condition ids in a within-subjects arm. GET …/assignment names an order by its JSON list of ids
 * (`["a", "b"]`); a dry run labels it "a → b".
 */
export function orderOfArm(armId: string, label?: string): string[] | null {
  if (armId.startsWith('[')) {
    try {
      const parsed: unknown = JSON.parse(armId);
      if (Array.isArray(parsed) && parsed.every((id) => typeof id === 'string')) return parsed;
    } catch {
      return null;
    }
  }
  if (label && label.includes(' → ')) return label.split(' → ');
  return null;
}

export function conditionCode(conditions: readonly ArmCondition[], id: string): string {
  return conditions.find((condition) => condition.id === id)?.code ?? '?';
}

/** "A → C → B" for an order; the code (and name) for a single condition. */
export function armLabel(
  conditions: readonly ArmCondition[],
  armId: string,
  label?: string,
): { code: string; name: string | null } {
  const order = orderOfArm(armId, label);
  if (order) return { code: order.map((id) => conditionCode(conditions, id)).join(' → '), name: null };
  const condition = conditions.find((c) => c.id === armId);
  return condition ? { code: condition.code, name: condition.internalName } : { code: label ?? armId, name: null };
}

export interface StratumPart {
  factorKey: string;
  level: string;
}

/** "sense_of_direction=<50|site=north" → its factor levels; "all" (no stratification) → none. */
export function stratumParts(stratumKey: string): StratumPart[] {
  if (stratumKey === 'all' || stratumKey === '') return [];
  return stratumKey.split('|').map((part) => {
    const at = part.indexOf('=');
    return at < 0 ? { factorKey: part, level: '' } : { factorKey: part.slice(0, at), level: part.slice(at + 1) };
  });
}

/** "sense of direction <50 · site north", or "Everyone" for the single unstratified stratum. */
export function stratumLabel(stratumKey: string): string {
  const parts = stratumParts(stratumKey);
  if (parts.length === 0) return 'Everyone (not stratified)';
  return parts.map((part) => `${part.factorKey.replace(/_/g, ' ')} ${part.level}`).join(' · ');
}
