/** "A · audio cues", or "Condition A" while the name is hidden behind its code. */
export function conditionDisplayName(condition: { code: string; internalName: string | null }): string {
  return condition.internalName ? `${condition.code} · ${condition.internalName}` : `Condition ${condition.code}`;
}
