import type { ReactNode, TableHTMLAttributes } from 'react';

type Props = Omit<TableHTMLAttributes<HTMLTableElement>, 'className' | 'children'> & {
  /** The cells (`<th>`) of the one heading row. */
  head: ReactNode;
  /** A note that stands instead of the table when the list is empty (pass false otherwise). */
  empty?: string | false;
  /** The rows (`<tr>`). */
  children: ReactNode;
};

/** The app's plain list table: small uppercase headings, rows split by hairlines, scrolling sideways inside itself when narrow; an empty list shows its note instead. */
export function ListTable({ head, empty, children, ...rest }: Props) {
  if (empty) return <p className="text-sm text-slate-500">{empty}</p>;
  // A wide table scrolls inside its own box on a narrow screen. The box is `relative` so
  // visually hidden (absolutely positioned) text inside it cannot widen the page.
  return (
    <div className="relative overflow-x-auto">
      <table className="w-full text-left text-sm" {...rest}>
        <thead className="text-xs uppercase tracking-wide text-slate-500">
          <tr>{head}</tr>
        </thead>
        <tbody className="divide-y divide-slate-100">{children}</tbody>
      </table>
    </div>
  );
}
