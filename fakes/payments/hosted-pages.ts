import { formatMoney } from '@shared/domain/money';
import type { Account, CheckoutSession, LineItem } from './store';

/*
 * The fake's hosted pages: a test payment page and a test onboarding page, in Platterpost's own plain look.
 * They are deliberately unlike any real provider's pages, and say on every screen that they are a test.
 */

export function escapeHtml(value: unknown): string {
  return String(value ?? '')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}

const styles = `
  :root { color-scheme: light; --ink: #1d2a2f; --muted: #5b6b70; --accent: #0f5c63; --line: #d5dedf; --bad: #a32020; }
  * { box-sizing: border-box; }
  body { margin: 0; font: 16px/1.5 system-ui, sans-serif; color: var(--ink); background: #f3f1ec; }
  header { background: var(--accent); color: #fff; padding: 0.75rem 1.25rem; display: flex; justify-content: space-between; }
  header strong { letter-spacing: 0.02em; }
  main { max-width: 30rem; margin: 2rem auto; background: #fff; border: 1px solid var(--line); border-radius: 6px; padding: 1.5rem; }
  h1 { font-size: 1.35rem; margin: 0 0 1rem; }
  table { width: 100%; border-collapse: collapse; margin-bottom: 1rem; }
  td { padding: 0.35rem 0; border-bottom: 1px solid var(--line); }
  td.amount { text-align: right; white-space: nowrap; }
  tr.total td { font-weight: 600; border-bottom: none; }
  label { display: block; margin: 0.75rem 0 0.25rem; font-weight: 600; }
  input { width: 100%; padding: 0.55rem; font: inherit; border: 1px solid var(--muted); border-radius: 4px; }
  .row { display: flex; gap: 0.75rem; } .row > div { flex: 1; }
  button { margin-top: 1.25rem; width: 100%; padding: 0.7rem; font: inherit; font-weight: 600; color: #fff; background: var(--accent); border: 0; border-radius: 4px; cursor: pointer; }
  .note { background: #fff7db; border: 1px solid #e6d38a; padding: 0.6rem 0.75rem; border-radius: 4px; font-size: 0.9rem; }
  .error { color: var(--bad); border: 1px solid var(--bad); background: #fdeeee; padding: 0.6rem 0.75rem; border-radius: 4px; }
  .muted { color: var(--muted); font-size: 0.9rem; }
  a { color: var(--accent); }
`;

function layout(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)} · Platterpost test payments</title><style>${styles}</style></head>
<body>
<header><strong>Platterpost</strong><span>Test payments · no real money moves</span></header>
<main>${body}</main>
</body></html>`;
}

export interface CheckoutPageModel {
  session: CheckoutSession;
  lineItems: LineItem[];
  error?: string;
  /** What the person typed, kept after a refusal; never the full number after a decline. */
  typed?: { expiry?: string; name?: string };
}

export function checkoutPage({ session, lineItems, error, typed }: CheckoutPageModel): string {
  const rows = lineItems
    .map(
      (item) =>
        `<tr><td>${escapeHtml(item.description)}${item.quantity > 1 ? ` × ${item.quantity}` : ''}</td>` +
        `<td class="amount">${escapeHtml(formatMoney(item.amount_total, item.currency))}</td></tr>`,
    )
    .join('');
  const cancel = session.cancel_url
    ? `<p class="muted"><a href="${escapeHtml(session.cancel_url)}">Cancel and go back</a></p>`
    : '';
  return layout(
    'Pay',
    `<h1>Pay for your recovery</h1>
<table>${rows}<tr class="total"><td>Total</td><td class="amount">${escapeHtml(formatMoney(session.amount_total, session.currency))}</td></tr></table>
<p class="note">This is a test page. Pay with <strong>4242 4242 4242 4242</strong> (succeeds) or
<strong>4000 0000 0000 0002</strong> (declined), any future expiry and any 3-digit code. Never enter a real card here.</p>
${error ? `<p class="error" role="alert">${escapeHtml(error)}</p>` : ''}
<form method="post" action="/pay/${escapeHtml(session.id)}" autocomplete="off">
  <label for="cardNumber">Card number</label>
  <input id="cardNumber" name="cardNumber" inputmode="numeric" placeholder="4242 4242 4242 4242" required>
  <div class="row">
    <div><label for="expiry">Expiry (MM/YY)</label>
    <input id="expiry" name="expiry" placeholder="12/34" value="${escapeHtml(typed?.expiry)}" required></div>
    <div><label for="cvc">Security code</label>
    <input id="cvc" name="cvc" inputmode="numeric" placeholder="123" required></div>
  </div>
  <button type="submit">Pay ${escapeHtml(formatMoney(session.amount_total, session.currency))}</button>
</form>
${cancel}`,
  );
}

export function messagePage(title: string, text: string, link?: { href: string; label: string }): string {
  return layout(
    title,
    `<h1>${escapeHtml(title)}</h1><p>${escapeHtml(text)}</p>` +
      (link ? `<p><a href="${escapeHtml(link.href)}">${escapeHtml(link.label)}</a></p>` : ''),
  );
}

export function onboardingPage(account: Account, token: string, refreshUrl: string | null): string {
  const leave = refreshUrl ? `<p class="muted"><a href="${escapeHtml(refreshUrl)}">Not now</a></p>` : '';
  return layout(
    'Set up payouts',
    `<h1>Set up payouts</h1>
<p>Account <code>${escapeHtml(account.id)}</code>${account.email ? ` for <strong>${escapeHtml(account.email)}</strong>` : ''}.</p>
<p class="note">This is a test page: no identity or bank details are collected. Finishing it marks the account
as able to take charges and receive payouts.</p>
<form method="post" action="/onboard/${escapeHtml(token)}">
  <label for="businessName">Business name (optional)</label>
  <input id="businessName" name="businessName" value="${escapeHtml(account.business_profile.name)}">
  <button type="submit">Finish setup</button>
</form>
${leave}`,
  );
}
