import type { StoredMessage } from './mail-fake';

// Plain server-rendered pages for the demo inbox: no client script, so it reads the same anywhere.

export function escapeHtml(value: string): string {
  return value
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}

const styles = `
  :root { color-scheme: light; --ink: #1f2430; --muted: #5d6475; --line: #d9dde5; --accent: #0b6e4f; }
  * { box-sizing: border-box; }
  body { margin: 0; font: 16px/1.5 system-ui, sans-serif; color: var(--ink); background: #f6f7f9; }
  header { background: var(--accent); color: #fff; padding: 0.75rem 1.5rem; }
  header a { color: #fff; text-decoration: none; font-weight: 600; }
  main { max-width: 60rem; margin: 1.5rem auto; padding: 0 1rem; }
  table { width: 100%; border-collapse: collapse; background: #fff; border: 1px solid var(--line); }
  th, td { text-align: left; padding: 0.5rem 0.75rem; border-bottom: 1px solid var(--line); vertical-align: top; }
  th { font-size: 0.85rem; color: var(--muted); font-weight: 600; }
  td a { color: var(--accent); }
  .empty { padding: 2rem; text-align: center; color: var(--muted); background: #fff; border: 1px solid var(--line); }
  dl { display: grid; grid-template-columns: max-content 1fr; gap: 0.25rem 1rem; background: #fff; padding: 1rem; border: 1px solid var(--line); }
  dt { color: var(--muted); }
  dd { margin: 0; word-break: break-word; }
  iframe { width: 100%; min-height: 32rem; border: 1px solid var(--line); background: #fff; }
  pre { white-space: pre-wrap; background: #fff; border: 1px solid var(--line); padding: 1rem; }
  form { margin-bottom: 1rem; display: flex; gap: 0.5rem; }
  input { flex: 1; padding: 0.4rem; font: inherit; }
  button { font: inherit; padding: 0.4rem 0.9rem; }
`;

function layout(title: string, body: string): string {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>${styles}</style>
</head>
<body>
<header><a href="/">Platterpost test inbox</a></header>
<main>
${body}
</main>
</body>
</html>`;
}

function formatDate(iso: string): string {
  return iso.replace('T', ' ').replace(/\.\d+Z$/, ' UTC');
}

export function renderInbox(messages: StoredMessage[], to?: string): string {
  const filter = `<form method="get" action="/">
<label for="to" hidden>Recipient</label>
<input id="to" name="to" type="email" placeholder="Show only mail to…" value="${escapeHtml(to ?? '')}">
<button type="submit">Filter</button>
</form>`;
  if (messages.length === 0) {
    return layout('Inbox', `<h1>Inbox</h1>${filter}<p class="empty">No messages yet.</p>`);
  }
  const rows = messages
    .map(
      (m) => `<tr>
<td><a href="/messages/${encodeURIComponent(m.id)}">${escapeHtml(m.subject || '(no subject)')}</a></td>
<td>${escapeHtml(m.from)}</td>
<td>${escapeHtml(m.to.join(', '))}</td>
<td><time datetime="${escapeHtml(m.date)}">${escapeHtml(formatDate(m.date))}</time></td>
</tr>`,
    )
    .join('\n');
  return layout(
    'Inbox',
    `<h1>Inbox <small>(${messages.length})</small></h1>${filter}
<table>
<thead><tr><th scope="col">Subject</th><th scope="col">From</th><th scope="col">To</th><th scope="col">Received</th></tr></thead>
<tbody>
${rows}
</tbody>
</table>`,
  );
}

export function renderMessage(m: StoredMessage): string {
  // The HTML part runs in an iframe sandboxed without scripts or same-origin rights,
  // so a message cannot act on the inbox page.
  const body = m.html
    ? `<iframe title="Message body" sandbox="" referrerpolicy="no-referrer" srcdoc="${escapeHtml(m.html)}"></iframe>`
    : `<pre>${escapeHtml(m.text)}</pre>`;
  return layout(
    m.subject || 'Message',
    `<p><a href="/">← Back to the inbox</a></p>
<h1>${escapeHtml(m.subject || '(no subject)')}</h1>
<dl>
<dt>From</dt><dd>${escapeHtml(m.from)}</dd>
<dt>To</dt><dd>${escapeHtml(m.to.join(', '))}</dd>
<dt>Received</dt><dd>${escapeHtml(formatDate(m.date))}</dd>
${m.messageId ? `<dt>Message-ID</dt><dd>${escapeHtml(m.messageId)}</dd>` : ''}
</dl>
<h2>Body</h2>
${body}
${m.html && m.text ? `<details><summary>Plain-text part</summary><pre>${escapeHtml(m.text)}</pre></details>` : ''}`,
  );
}

export function renderNotFound(id: string): string {
  return layout('Not found', `<h1>No such message</h1><p>There is no message with id ${escapeHtml(id)}. It may have been cleared.</p><p><a href="/">Back to the inbox</a></p>`);
}
