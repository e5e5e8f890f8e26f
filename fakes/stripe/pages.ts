/**
 * The fake's hosted pages: a checkout pay page, a billing portal page and an invoice page.
 * Plain, clearly labelled local test pages with their own neutral look; they collect no card
 * details and every payment made on them succeeds.
 */
import type { StoredCheckout } from "./engine";
import type { WCustomer, WInvoice, WPortalSession, WPrice, WSubscription } from "./types";
import { esc, formatDate, formatMoney } from "./util";

const STYLE = `
  :root { color-scheme: light; }
  body { margin: 0; font: 15px/1.5 system-ui, sans-serif; background: #f3f3f0; color: #222; }
  .banner { background: #fde68a; color: #3b2f00; padding: 8px 16px; font-weight: 600; text-align: center; border-bottom: 1px solid #d4b94a; }
  main { max-width: 640px; margin: 32px auto; padding: 24px; background: #fff; border: 1px solid #cfcfc8; }
  h1 { font-size: 20px; margin: 0 0 4px; }
  h2 { font-size: 16px; margin: 24px 0 8px; }
  p.sub { margin: 0 0 16px; color: #555; }
  table { width: 100%; border-collapse: collapse; margin: 8px 0 16px; }
  th, td { text-align: left; padding: 6px 8px; border-bottom: 1px solid #e4e4de; vertical-align: top; }
  td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
  tfoot td { font-weight: 600; border-bottom: none; }
  form.inline { display: inline-block; margin: 0 12px 8px 0; }
  label { display: block; margin: 8px 0 4px; font-weight: 600; }
  input[type=email], input[type=text], input[type=number] { font: inherit; padding: 6px 8px; border: 1px solid #999; width: 12em; }
  button { font: inherit; padding: 8px 16px; border: 1px solid #333; background: #333; color: #fff; cursor: pointer; }
  button.secondary { background: #fff; color: #333; }
  .notice { padding: 8px 12px; border: 1px solid #8fb08f; background: #eef6ee; margin: 0 0 16px; }
  .error { padding: 8px 12px; border: 1px solid #c07070; background: #fbeeee; margin: 0 0 16px; }
  .muted { color: #666; font-size: 13px; }
  .actions { margin-top: 16px; display: flex; gap: 16px; align-items: center; flex-wrap: wrap; }
`;

function page(title: string, body: string, status?: string): string {
  return `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${esc(title)}</title><style>${STYLE}</style></head>
<body>
<div class="banner" role="note">Local test page of the Stripe fake: no card is charged and no money moves.</div>
<main>
${status ? `<p class="muted">${esc(status)}</p>` : ""}
${body}
</main>
</body>
</html>`;
}

function every(price: WPrice): string {
  const r = price.recurring;
  if (!r) return "once";
  return r.interval_count > 1 ? `every ${r.interval_count} ${r.interval}s` : `per ${r.interval}`;
}

/** The checkout pay page (GET /checkout/:id). `error` re-renders it after a refused payment. */
export function checkoutPage(cs: StoredCheckout, productName: (p: WPrice) => string, customer: WCustomer | null, error?: string): string {
  const s = cs.session;
  const title = "Checkout (test)";
  if (s.status !== "open") {
    const body =
      s.status === "complete"
        ? `<h1>This checkout is complete</h1><p>The subscription has been created.</p>${s.success_url ? `<p><a href="${esc(s.success_url.replace(/\{CHECKOUT_SESSION_ID\}/g, s.id))}">Continue</a></p>` : ""}`
        : `<h1>This checkout has expired</h1><p>Start again from the application.</p>${s.cancel_url ? `<p><a href="${esc(s.cancel_url)}">Cancel and go back</a></p>` : ""}`;
    return page(title, body, `Checkout session ${s.id}`);
  }
  const rows = cs.lineItems
    .map((li) => {
      const price = li.price as WPrice;
      return `<tr><td>${esc(productName(price))}</td><td class="num">${esc(formatMoney(price.unit_amount ?? 0, price.currency))} ${esc(every(price))}</td><td class="num" data-testid="quantity">${esc(li.quantity ?? 1)}</td><td class="num">${esc(formatMoney(li.amount_total, li.currency))}</td></tr>`;
    })
    .join("\n");
  const firstPrice = cs.lineItems[0].price as WPrice;
  const trialDays = cs.subscriptionData.trialPeriodDays;
  const total = formatMoney(s.amount_total ?? 0, s.currency ?? firstPrice.currency);
  const who = customer?.email ?? s.customer_email;
  const needEmail = !customer && !s.customer_email;
  const body = `
<h1>Subscribe</h1>
<p class="sub">${who ? `For ${esc(who)}` : "A new customer will be created."}</p>
${error ? `<div class="error" role="alert">${esc(error)}</div>` : ""}
<table>
  <thead><tr><th>Item</th><th class="num">Unit price</th><th class="num">Quantity</th><th class="num">Amount</th></tr></thead>
  <tbody>
${rows}
  </tbody>
  <tfoot><tr><td colspan="3">Total ${esc(every(firstPrice))}</td><td class="num" data-testid="total">${esc(total)}</td></tr></tfoot>
</table>
${trialDays ? `<p>Free trial of ${esc(trialDays)} days: nothing is due today; the first payment of ${esc(total)} is taken when the trial ends.</p>` : `<p>Due today: <strong>${esc(total)}</strong>.</p>`}
<form method="post" action="/checkout/${esc(s.id)}/pay">
  ${needEmail ? `<label for="email">Email</label><input id="email" name="email" type="email" required autocomplete="off">` : ""}
  ${needEmail ? `<label for="name">Name (optional)</label><input id="name" name="name" type="text" autocomplete="off">` : ""}
  <div class="actions">
    <button type="submit">Pay and subscribe</button>
    ${s.cancel_url ? `<a href="${esc(s.cancel_url)}">Cancel and go back</a>` : ""}
  </div>
</form>
<p class="muted">Test page: no card details are asked for and the payment always succeeds. To test a failed renewal, use POST /_fake/subscriptions/:id/fail_payment.</p>`;
  return page(title, body, `Checkout session ${s.id}`);
}

function statusText(sub: WSubscription): string {
  const end = sub.items.data[0]?.current_period_end;
  switch (sub.status) {
    case "trialing":
      return `Trial until ${formatDate(sub.trial_end ?? end ?? 0)}`;
    case "active":
      return sub.cancel_at_period_end && sub.cancel_at ? `Active, cancels on ${formatDate(sub.cancel_at)}` : `Active, renews on ${formatDate(end ?? 0)}`;
    case "past_due":
      return "Payment overdue";
    case "canceled":
      return `Ended on ${formatDate(sub.ended_at ?? 0)}`;
    default:
      return String(sub.status);
  }
}

/** The billing portal page (GET /portal/:id). */
export function portalPage(opts: {
  session: WPortalSession;
  customer: WCustomer;
  subscriptions: WSubscription[];
  invoices: WInvoice[];
  productName: (p: WPrice) => string;
  returnLabel: string;
  cancelMode: "at_period_end" | "immediately";
  notice?: string;
  error?: string;
}): string {
  const { session, customer } = opts;
  const live = opts.subscriptions.filter((s) => s.status !== "canceled");
  const ended = opts.subscriptions.filter((s) => s.status === "canceled");
  const subBlocks = live
    .map((sub) => {
      const rows = sub.items.data
        .map((i) => `<tr><td>${esc(opts.productName(i.price))}</td><td class="num">${esc(formatMoney(i.price.unit_amount ?? 0, i.price.currency))} ${esc(every(i.price))}</td><td class="num" data-testid="seats">${esc(i.quantity ?? 1)}</td><td class="num">${esc(formatMoney((i.price.unit_amount ?? 0) * (i.quantity ?? 1), i.price.currency))}</td></tr>`)
        .join("\n");
      const total = sub.items.data.reduce((s, i) => s + (i.price.unit_amount ?? 0) * (i.quantity ?? 1), 0);
      const qty = sub.items.data[0]?.quantity ?? 1;
      const cancelForm = sub.cancel_at_period_end
        ? `<form class="inline" method="post" action="/portal/${esc(session.id)}/keep"><input type="hidden" name="subscription" value="${esc(sub.id)}"><button type="submit" class="secondary">Keep subscription</button></form>`
        : `<form class="inline" method="post" action="/portal/${esc(session.id)}/cancel"><input type="hidden" name="subscription" value="${esc(sub.id)}"><button type="submit" class="secondary">Cancel subscription</button></form>
           <p class="muted">${opts.cancelMode === "immediately" ? "Cancelling ends the subscription now." : "Cancelling takes effect at the end of the current period."}</p>`;
      return `
<section data-subscription="${esc(sub.id)}">
<h2>Subscription</h2>
<p><span data-testid="status">${esc(statusText(sub))}</span> <span class="muted">(${esc(sub.id)})</span></p>
<table>
  <thead><tr><th>Item</th><th class="num">Unit price</th><th class="num">Seats</th><th class="num">Amount</th></tr></thead>
  <tbody>
${rows}
  </tbody>
  <tfoot><tr><td colspan="3">Total ${esc(every(sub.items.data[0].price))}</td><td class="num">${esc(formatMoney(total, sub.currency))}</td></tr></tfoot>
</table>
<form method="post" action="/portal/${esc(session.id)}/seats">
  <input type="hidden" name="subscription" value="${esc(sub.id)}">
  <label for="quantity-${esc(sub.id)}">Seats${sub.items.data.length > 1 ? " (applies to every item)" : ""}</label>
  <input id="quantity-${esc(sub.id)}" name="quantity" type="number" min="1" step="1" value="${esc(qty)}" required>
  <button type="submit">Update seats</button>
</form>
<div class="actions">${cancelForm}</div>
</section>`;
    })
    .join("\n");
  const invoiceRows = opts.invoices
    .slice(0, 10)
    .map((inv) => `<tr><td>${esc(formatDate(inv.created))}</td><td>${esc(inv.number ?? inv.id)}</td><td>${esc(inv.status)}</td><td class="num">${esc(formatMoney(inv.status === "paid" ? inv.amount_paid : inv.amount_due, inv.currency))}</td><td><a href="${esc(inv.hosted_invoice_url ?? "#")}">View</a></td></tr>`)
    .join("\n");
  const body = `
<h1>Billing (test portal)</h1>
<p class="sub">${esc(customer.email ?? customer.id)}</p>
${opts.notice ? `<div class="notice" role="status">${esc(opts.notice)}</div>` : ""}
${opts.error ? `<div class="error" role="alert">${esc(opts.error)}</div>` : ""}
${live.length ? subBlocks : "<p>No current subscription.</p>"}
${ended.length ? `<h2>Ended subscriptions</h2><ul>${ended.map((s) => `<li>${esc(s.id)}: ${esc(statusText(s))}</li>`).join("")}</ul>` : ""}
${invoiceRows ? `<h2>Invoices</h2><table><thead><tr><th>Date</th><th>Number</th><th>Status</th><th class="num">Amount</th><th></th></tr></thead><tbody>${invoiceRows}</tbody></table>` : ""}
<div class="actions">${session.return_url ? `<a href="${esc(session.return_url)}">${esc(opts.returnLabel)}</a>` : ""}</div>`;
  return page("Billing portal (test)", body, `Portal session ${session.id}`);
}

/** The hosted invoice page (GET /invoice/:id). */
export function invoicePage(inv: WInvoice, notice?: string, error?: string): string {
  const rows = inv.lines.data
    .map((l) => `<tr><td>${esc(l.description)}<div class="muted">${esc(formatDate(l.period.start))} – ${esc(formatDate(l.period.end))}</div></td><td class="num">${esc(l.quantity)}</td><td class="num">${esc(formatMoney(l.amount, l.currency))}</td></tr>`)
    .join("\n");
  const body = `
<h1>Invoice ${esc(inv.number ?? inv.id)}</h1>
<p class="sub">Status: <strong data-testid="status">${esc(inv.status)}</strong> · ${esc(inv.customer_email ?? "")}</p>
${notice ? `<div class="notice" role="status">${esc(notice)}</div>` : ""}
${error ? `<div class="error" role="alert">${esc(error)}</div>` : ""}
<table>
  <thead><tr><th>Description</th><th class="num">Qty</th><th class="num">Amount</th></tr></thead>
  <tbody>
${rows}
  </tbody>
  <tfoot>
    <tr><td colspan="2">Total</td><td class="num">${esc(formatMoney(inv.total, inv.currency))}</td></tr>
    <tr><td colspan="2">Paid</td><td class="num">${esc(formatMoney(inv.amount_paid, inv.currency))}</td></tr>
    <tr><td colspan="2">Remaining</td><td class="num">${esc(formatMoney(inv.amount_remaining, inv.currency))}</td></tr>
  </tfoot>
</table>
${inv.status === "open" ? `<form method="post" action="/invoice/${esc(inv.id)}/pay"><button type="submit">Pay this invoice</button></form>` : ""}`;
  return page(`Invoice ${inv.number ?? inv.id} (test)`, body, `Invoice ${inv.id}`);
}

/** A plain message page (errors on hosted pages). */
export function messagePage(title: string, message: string): string {
  return page(title, `<h1>${esc(title)}</h1><p>${esc(message)}</p>`);
}
