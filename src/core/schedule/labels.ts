/**
 * Visit labels are compared ignoring case and spaces (SPEC §4): "Week 12", "week12" and " WEEK 12 " are one label.
 * Example: labelKey(" Week 12 ") → "week12". O(length).
 */
export function labelKey(label: string): string {
  return label.replace(/\s+/g, '').toLowerCase();
}
