// E-mail templates of our own: each returns a subject and both an HTML and a text part.
export interface RenderedEmail {
  subject: string;
  text: string;
  html: string;
}

const escapeHtml = (s: string) =>
  s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');

const FOOTER_TEXT =
  'Platterpost connects repair shops with the recovery labs that can save their customers\u2019 data.\nYou receive this because you have an account or a case on the network.';

interface Block {
  heading: string;
  paragraphs: string[];
  action?: { label: string; url: string };
  note?: string;
}

function layout(block: Block): { text: string; html: string } {
  const text = [
    block.heading,
    '',
    ...block.paragraphs.flatMap((p) => [p, '']),
    ...(block.action ? [`${block.action.label}: ${block.action.url}`, ''] : []),
    ...(block.note ? [block.note, ''] : []),
    '-- ',
    FOOTER_TEXT,
  ].join('\n');
  const html = `<!doctype html><html><body style="margin:0;background:#f4f1ea;font-family:'DM Sans',Arial,sans-serif;color:#1f2a30">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0"><tr><td align="center" style="padding:24px">
<table role="presentation" width="560" cellpadding="0" cellspacing="0" style="background:#ffffff;border-radius:8px;padding:28px">
<tr><td style="font-size:13px;letter-spacing:.08em;text-transform:uppercase;color:#2f6b5e;font-weight:700">Platterpost</td></tr>
<tr><td><h1 style="font-size:20px;margin:12px 0 16px">${escapeHtml(block.heading)}</h1>
${block.paragraphs.map((p) => `<p style="line-height:1.5;margin:0 0 12px">${escapeHtml(p)}</p>`).join('\n')}
${
  block.action
    ? `<p style="margin:20px 0"><a href="${escapeHtml(block.action.url)}" style="background:#2f6b5e;color:#ffffff;padding:10px 18px;border-radius:6px;text-decoration:none;font-weight:600">${escapeHtml(block.action.label)}</a></p>
<p style="font-size:12px;color:#5b666c">If the button does not work, open this address: ${escapeHtml(block.action.url)}</p>`
    : ''
}
${block.note ? `<p style="font-size:13px;color:#5b666c">${escapeHtml(block.note)}</p>` : ''}
</td></tr>
<tr><td style="border-top:1px solid #e3ded3;padding-top:12px;font-size:12px;color:#5b666c">${escapeHtml(FOOTER_TEXT).replace('\n', '<br>')}</td></tr>
</table></td></tr></table></body></html>`;
  return { text, html };
}

export const emailTemplates = {
  password_reset: (d: { name: string; url: string; minutes: number }) => ({
    subject: 'Reset your Platterpost password',
    ...layout({
      heading: 'Reset your password',
      paragraphs: [`Hello ${d.name},`, `Someone asked to reset the password for your Platterpost account. The link works once and for ${d.minutes} minutes.`],
      action: { label: 'Choose a new password', url: d.url },
      note: 'If you did not ask for this, you can ignore this message; your password stays as it is.',
    }),
  }),
  staff_invitation: (d: { name: string; inviterName: string; organizationName: string; roleLabel: string; url: string; hours: number }) => ({
    subject: `${d.inviterName} invited you to ${d.organizationName} on Platterpost`,
    ...layout({
      heading: `Join ${d.organizationName} on Platterpost`,
      paragraphs: [
        `Hello ${d.name},`,
        `${d.inviterName} has invited you to join ${d.organizationName} as ${d.roleLabel}.`,
        `The link works once and for ${d.hours} hours.`,
      ],
      action: { label: 'Accept the invitation', url: d.url },
    }),
  }),
  // Referrals and routing.
  lab_offer_new: (d: { name: string; labName: string; reference: string; device: string; skills: string; shop: string; deadline: string; url: string }) => ({
    subject: `New case offered to ${d.labName}: ${d.reference} (answer by ${d.deadline})`,
    ...layout({
      heading: `A case is offered to ${d.labName}`,
      paragraphs: [
        `Hello ${d.name},`,
        `Case ${d.reference} from ${d.shop}: ${d.device}. It needs ${d.skills}.`,
        `Please accept or decline by ${d.deadline}. If nobody answers by then, the case goes to the next lab.`,
      ],
      action: { label: 'Open the offer', url: d.url },
    }),
  }),
  lab_case_auto_accepted: (d: { name: string; labName: string; reference: string; device: string; skills: string; shop: string; url: string }) => ({
    subject: `Case ${d.reference} accepted for ${d.labName} by your auto-accept rule`,
    ...layout({
      heading: `${d.reference} was accepted automatically`,
      paragraphs: [
        `Hello ${d.name},`,
        `Case ${d.reference} from ${d.shop} (${d.device}, needs ${d.skills}) matched one of ${d.labName}’s auto-accept rules, so the network accepted it for you.`,
        'The shop will print a label and send the device to you.',
      ],
      action: { label: 'See your cases', url: d.url },
    }),
  }),
  lab_offer_withdrawn: (d: { name: string; labName: string; reference: string; reason: string }) => ({
    subject: `Case ${d.reference} is no longer offered to ${d.labName}`,
    ...layout({
      heading: `${d.reference} was withdrawn`,
      paragraphs: [`Hello ${d.name},`, `Case ${d.reference} is no longer with ${d.labName}: ${d.reason}`, 'Nothing needs doing on your side.'],
    }),
  }),
  referral_accepted: (d: { name: string; reference: string; customerName: string; labName: string; url: string; fromLab?: string | null }) => ({
    subject: `${d.labName} accepted case ${d.reference}`,
    ...layout({
      heading: `A lab accepted ${d.reference}`,
      paragraphs: [
        `Hello ${d.name},`,
        `${d.labName} accepted the case of ${d.customerName} (${d.reference}).`,
        // A case moving between labs: the device is already at a lab, which ships it on.
        d.fromLab
          ? `${d.fromLab} ships the device on to ${d.labName}; nothing is needed from you.`
          : 'Next: buy the prepaid label and pack the device by the packing rules shown on the case.',
      ],
      action: { label: 'Open the case', url: d.url },
    }),
  }),
  referral_needs_attention: (d: { name: string; reference: string; shop: string; reason: string; url: string }) => ({
    subject: `Case ${d.reference} needs a lab`,
    ...layout({
      heading: `${d.reference} needs routing by hand`,
      paragraphs: [`Hello ${d.name},`, `No lab has taken case ${d.reference} from ${d.shop}.`, d.reason],
      action: { label: 'Open the attention queue', url: d.url },
    }),
  }),
  // The customer's side of a case: each message carries the customer's private link.
  customer_case_link: (d: { customerName: string; reference: string; shopName: string; url: string }) => ({
    subject: `Your data recovery case ${d.reference}`,
    ...layout({
      heading: 'Follow your data recovery',
      paragraphs: [
        `Hello ${d.customerName},`,
        `${d.shopName} sent your device to a recovery lab through Platterpost (case ${d.reference}). Your private page shows where it is, the lab’s quote when it is ready, and the files the lab recovers.`,
      ],
      action: { label: 'Open your case', url: d.url },
      note: 'Keep this link to yourself: anyone who has it can see the case. Your shop can switch it off and send you a new one.',
    }),
  }),
  customer_quote_ready: (d: { customerName: string; reference: string; labName: string; shopName: string; total: string; recoverability: string; url: string }) => ({
    subject: `Your recovery quote is ready: ${d.total} (case ${d.reference})`,
    ...layout({
      heading: 'The lab has examined your device',
      paragraphs: [
        `Hello ${d.customerName},`,
        `${d.labName} has examined the device ${d.shopName} sent in (case ${d.reference}). Their estimate: ${d.recoverability}.`,
        `The quote comes to ${d.total}, line by line on your page. Nothing is charged until you approve it and pay.`,
      ],
      action: { label: 'See the quote', url: d.url },
      note: 'Keep this link to yourself: anyone who has it can see the case.',
    }),
  }),
  customer_no_recovery: (d: { customerName: string; reference: string; labName: string; shopName: string; url: string }) => ({
    subject: `Case ${d.reference}: the lab cannot recover the data`,
    ...layout({
      heading: 'No recovery is possible',
      paragraphs: [
        `Hello ${d.customerName},`,
        `We are sorry: after examining the device, ${d.labName} found that the data on it cannot be recovered. You owe nothing for the evaluation.`,
        `${d.shopName} will arrange the device’s return. Your page has the lab’s findings.`,
      ],
      action: { label: 'Open your case', url: d.url },
    }),
  }),
  customer_payment_received: (d: { customerName: string; reference: string; amount: string; labName: string }) => ({
    subject: `Payment received for case ${d.reference}: ${d.amount}`,
    ...layout({
      heading: 'Thank you: your payment arrived',
      paragraphs: [
        `Hello ${d.customerName},`,
        `We received ${d.amount} for case ${d.reference}. ${d.labName} now starts imaging your device and recovering the files.`,
        'When the files are recovered you get an e-mail asking you to check that the ones that matter are there, before the data ships back.',
      ],
    }),
  }),
  customer_refund_issued: (d: { customerName: string; reference: string; amount: string; labName: string; reason: string }) => ({
    subject: `Refund of ${d.amount} for case ${d.reference}`,
    ...layout({
      heading: 'Money on its way back to you',
      paragraphs: [
        `Hello ${d.customerName},`,
        `${d.labName} has refunded ${d.amount} for case ${d.reference} to the card you paid with. The reason given: ${d.reason}.`,
        'Your card issuer decides when it shows on your statement; it can take several business days.',
      ],
    }),
  }),
  customer_files_ready: (d: { customerName: string; reference: string; labName: string; fileCount: string; url: string }) => ({
    subject: `Your recovered files are ready to review (case ${d.reference})`,
    ...layout({
      heading: 'Check your recovered files',
      paragraphs: [
        `Hello ${d.customerName},`,
        `${d.labName} has recovered ${d.fileCount} from your device (case ${d.reference}).`,
        'Your page groups them by the kinds of files you said matter most. Please confirm that what you need is there, or tell the lab what is missing, before the data ships back.',
      ],
      action: { label: 'Review the files', url: d.url },
      note: 'Keep this link to yourself: anyone who has it can see the case.',
    }),
  }),
  webhook_endpoint_disabled: (d: { name: string; url: string; reason: string }) => ({
    subject: 'A webhook endpoint of yours was disabled',
    ...layout({
      heading: 'We stopped sending events to one of your endpoints',
      paragraphs: [
        `Hello ${d.name},`,
        `${d.reason}, so we disabled the endpoint ${d.url} and stopped retrying its events.`,
        'When it answers again, enable it under Settings → Webhooks; you can send missed events again from its delivery log.',
      ],
    }),
  }),
  // Money: monthly statements and payouts (settlement).
  statement_ready: (d: { name: string; organizationName: string; period: string; total: string; payout: string; note: string; url: string }) => ({
    subject: `Your Platterpost statement for ${d.period} is ready`,
    ...layout({
      heading: `Statement for ${d.period}`,
      paragraphs: [
        `Hello ${d.name},`,
        `The statement of ${d.organizationName} for ${d.period} is ready: ${d.total} in all, ${d.payout} to be paid out.`,
        d.note,
        'Every line on it is linked to its case, so you can reconcile it with your own records.',
      ],
      action: { label: 'Open your statements', url: d.url },
    }),
  }),
  payout_sent: (d: { name: string; organizationName: string; period: string; amount: string; transferId: string; url: string }) => ({
    subject: `Payout of ${d.amount} sent for ${d.period}`,
    ...layout({
      heading: `${d.amount} is on its way`,
      paragraphs: [
        `Hello ${d.name},`,
        `We sent ${d.amount} to the payout account of ${d.organizationName} for ${d.period} (transfer ${d.transferId}).`,
        'Your payment provider moves it on to your bank on its own schedule.',
      ],
      action: { label: 'See the statement', url: d.url },
    }),
  }),
  payout_failed: (d: { name: string; organizationName: string; period: string; amount: string; reason: string; nextStep: string; url: string }) => ({
    subject: `Payout for ${d.period} could not be sent yet`,
    ...layout({
      heading: 'A payout did not go through',
      paragraphs: [`Hello ${d.name},`, `The payout of ${d.amount} to ${d.organizationName} for ${d.period} failed: ${d.reason}`, d.nextStep],
      action: { label: 'Check your payout account', url: d.url },
      note: 'Nothing is lost: the amount stays on your statement until it is paid, and it is never paid twice.',
    }),
  }),
  // Shipping and receiving.
  box_checked_in: (d: { name: string; reference: string; labName: string; customerName: string; url: string }) => ({
    subject: `Box delivered and checked in at ${d.labName}: ${d.reference}`,
    ...layout({
      heading: `${d.reference} arrived at ${d.labName}`,
      paragraphs: [
        `Hello ${d.name},`,
        `The box for ${d.customerName} (${d.reference}) was delivered and checked in at ${d.labName}: the box, its seal and its contents are in order.`,
        'The lab evaluates the device next and sends a quote.',
      ],
      action: { label: 'Open the case', url: d.url },
    }),
  }),
  case_on_hold: (d: { name: string; reference: string; labName: string; reason: string; url: string }) => ({
    subject: `Case ${d.reference} is on hold at ${d.labName}`,
    ...layout({
      heading: `${d.reference} is on hold`,
      paragraphs: [`Hello ${d.name},`, `${d.labName} checked the box in and put the case on hold. ${d.reason}`, 'The lab will contact you about what happens next.'],
      action: { label: 'Open the case', url: d.url },
    }),
  }),
  case_transfer: (d: { name: string; reference: string; fromLab: string; url: string }) => ({
    subject: `Case ${d.reference} moves to another lab`,
    ...layout({
      heading: `${d.reference} moves to another lab`,
      paragraphs: [
        `Hello ${d.name},`,
        `${d.fromLab} examined the device and cannot do the work. The case is offered to the next lab, and ${d.fromLab} ships the device there itself.`,
        'Nothing needs doing on your side; no new label is needed.',
      ],
      action: { label: 'Open the case', url: d.url },
    }),
  }),
  shipment_exception: (d: { name: string; reference: string; carrier: string; trackingCode: string; message: string; url: string }) => ({
    subject: `Carrier exception for ${d.reference} (${d.trackingCode})`,
    ...layout({
      heading: `The carrier reported a problem with ${d.reference}`,
      paragraphs: [`Hello ${d.name},`, `${d.carrier} reported for tracking ${d.trackingCode}: ${d.message}`, 'Usually the box moves on within a day; the case shows every scan.'],
      action: { label: 'Open the case', url: d.url },
    }),
  }),
} satisfies Record<string, (data: never) => RenderedEmail>;

export type EmailTemplate = keyof typeof emailTemplates;
export type EmailData<T extends EmailTemplate> = Parameters<(typeof emailTemplates)[T]>[0];
