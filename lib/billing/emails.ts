import type { OutgoingMail } from '@/lib/mail/mailer';
import { formatUsd } from './plans';

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** To the billing contacts when the payment service could not collect an invoice. */
export function paymentFailedMail(
  to: string,
  input: { workspaceName: string; invoiceNumber: string | null; amountDueCents: number; billingUrl: string },
): OutgoingMail {
  const invoice = input.invoiceNumber ? `invoice ${input.invoiceNumber}` : 'the latest invoice';
  const lines = [
    `The payment of ${formatUsd(input.amountDueCents)} for ${invoice} of the Tropopass workspace “${input.workspaceName}” did not go through: the card on file was declined.`,
    'Until it is paid, nobody in the workspace can save new screenings or import flights. Everything already there stays readable.',
    'What to do: open Billing in the workspace settings, put a card that works on file, then choose “Pay the open invoice”. Screening resumes as soon as the payment succeeds.',
    'You get this message as the billing e-mail, a finance admin or an owner of the workspace.',
  ];
  const text = [...lines, '', `Billing settings: ${input.billingUrl}`, '', '— Tropopass'].join('\n');
  const html = `<div style="font-family:sans-serif;max-width:560px">${lines.map((l) => `<p>${esc(l)}</p>`).join('')}<p><a href="${esc(
    input.billingUrl,
  )}">Open billing settings</a></p><p style="color:#667">— Tropopass</p></div>`;
  return { to, subject: `Payment failed for ${input.workspaceName}: screening is paused`, text, html };
}

/** To the billing contacts when a period's usage reaches 80 % or 100 % of the workspace's budget. */
export function budgetAlertMail(
  to: string,
  input: {
    workspaceName: string;
    threshold: 80 | 100;
    budgetCents: number;
    usageChargeCents: number;
    units: number;
    periodEnd: string;
    hardStop: boolean;
    billingUrl: string;
  },
): OutgoingMail {
  const reached = input.threshold === 100 ? 'has reached' : 'has reached 80 % of';
  const lines = [
    `Usage of the Tropopass workspace “${input.workspaceName}” ${reached} its monthly usage budget of ${formatUsd(input.budgetCents)}: ${input.units.toLocaleString('en-GB')} billable units so far this billing period, ${formatUsd(input.usageChargeCents)} before the monthly fee. The period ends on ${input.periodEnd.slice(0, 10)}.`,
    input.threshold === 100
      ? input.hardStop
        ? 'The hard stop is on: new screenings and imports are refused until the next period, or until an owner or finance admin raises the budget or turns the hard stop off.'
        : 'The hard stop is off, so screening goes on and keeps adding to the charge.'
      : input.hardStop
        ? 'The hard stop is on: new screenings and imports will be refused once the budget is reached.'
        : 'The hard stop is off: screening will go on past the budget.',
    'You get this message as the billing e-mail, a finance admin or an owner of the workspace. Each alert is sent once a billing period.',
  ];
  const text = [...lines, '', `Billing settings: ${input.billingUrl}`, '', '— Tropopass'].join('\n');
  const html = `<div style="font-family:sans-serif;max-width:560px">${lines.map((l) => `<p>${esc(l)}</p>`).join('')}<p><a href="${esc(input.billingUrl)}">Open billing settings</a></p><p style="color:#667">— Tropopass</p></div>`;
  return { to, subject: `${input.workspaceName}: ${input.threshold} % of the monthly usage budget used`, text, html };
}
