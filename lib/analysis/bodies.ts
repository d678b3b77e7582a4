/** An obstacle's name in quotes for a reason; arm bodies ("base", "link 3", "tool", "payload") as they are. */
export function quoteBody(name: string): string {
  return /^(base|tool|payload|link \d+)$/.test(name) ? name : `'${name}'`;
}
