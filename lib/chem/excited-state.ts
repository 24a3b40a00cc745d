/**
 * Whether a name marks an electronically excited state: "excited", "singlet", a "*", or a term symbol of the usual
 * excited states of small species — O(1D), O(1S), N(2D), N(2P), O2(a1Δg), O2(b1Σg+) (common practice of mechanism
 * and data naming; the list is from memory, not exhaustive). Ground-state symbols such as O(3P) are not marks.
 * An InChI cannot tell an excited state from the ground state, so only names can. Pure.
 */
export function marksExcitedState(name: string): boolean {
  return /excited|singlet|\*|\(\s*(?:1D|1S|2D|2P|a\s*1|b\s*1)/i.test(name);
}
