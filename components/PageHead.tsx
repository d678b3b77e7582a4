import type { ReactNode } from "react";

/** "1 arm", "3 arms": a count with its noun (plural by adding s). */
function countOf(n: number, noun: string): string {
  return `${n} ${noun}${n === 1 ? "" : "s"}`;
}

/** The head of a list page: title, a count of what is listed, and the page's actions. */
export function PageHead({ title, count, noun, children }: { title: string; count: number; noun: string; children?: ReactNode }) {
  return (
    <div className="page-head">
      <h1>{title}</h1>
      <span className="sub">{countOf(count, noun)}</span>
      <div className="actions">{children}</div>
    </div>
  );
}
