import type { InvoiceRow } from "@/lib/billing/portal";
import { formatMoney } from "@/lib/billing/plans";

const STATUS: Record<string, string> = { paid: "Paid", open: "Open", draft: "Draft", void: "Void", uncollectible: "Uncollectible" };

/** The invoices Stripe holds for the workspace, newest first. */
export function InvoicesTable({ invoices, error }: { invoices: InvoiceRow[]; error: string | null }) {
  if (error) return <p className="text-ink-2">{error}</p>;
  if (invoices.length === 0) return <p className="text-ink-3">No invoices yet.</p>;
  return (
    <table className="table-dense" aria-label="Invoices">
      <thead>
        <tr>
          <th>Date</th>
          <th>Number</th>
          <th>Status</th>
          <th className="num">Amount</th>
          <th />
        </tr>
      </thead>
      <tbody>
        {invoices.map((inv) => (
          <tr key={inv.id}>
            <td className="mono">{new Date(inv.created).toISOString().slice(0, 10)}</td>
            <td className="mono">{inv.number ?? inv.id}</td>
            <td>{STATUS[inv.status] ?? inv.status}</td>
            <td className="num mono">{formatMoney(inv.amount, inv.currency)}</td>
            <td className="text-right">
              {inv.url ? (
                <a href={inv.url} className="text-copper underline-offset-2 hover:underline" target="_blank" rel="noreferrer">
                  View
                </a>
              ) : null}
              {inv.pdf ? (
                <a href={inv.pdf} className="ml-3 text-copper underline-offset-2 hover:underline" target="_blank" rel="noreferrer">
                  PDF
                </a>
              ) : null}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
