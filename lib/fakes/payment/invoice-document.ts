import { formatMoney } from './common';
import type { FakeInvoice } from './types';

/** The pages behind `hosted_invoice_url` (HTML) and `invoice_pdf` (a one-page PDF). */

function isoDate(seconds: number): string {
  return new Date(seconds * 1000).toISOString().slice(0, 10);
}

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

function summaryLines(invoice: FakeInvoice): string[] {
  return [
    `Invoice ${invoice.number ?? invoice.id}`,
    `Status: ${invoice.status}`,
    `Customer: ${invoice.customer_name ?? invoice.customer_email ?? invoice.customer}`,
    `Period: ${isoDate(invoice.period_start)} to ${isoDate(invoice.period_end)}`,
  ];
}

export function renderInvoiceHtml(invoice: FakeInvoice): string {
  const rows = invoice.lines.data
    .map(
      (line) =>
        `<tr><td>${escapeHtml(line.description)}</td><td style="text-align:right">${line.quantity}</td>` +
        `<td style="text-align:right">${escapeHtml(formatMoney(line.amount, line.currency))}</td></tr>`,
    )
    .join('\n');
  const [title, ...rest] = summaryLines(invoice);
  return `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><title>${escapeHtml(title)}</title></head>
<body style="font-family:system-ui,sans-serif;max-width:44rem;margin:2rem auto">
<h1>${escapeHtml(title)}</h1>
${rest.map((l) => `<p>${escapeHtml(l)}</p>`).join('\n')}
<table style="width:100%;border-collapse:collapse">
<thead><tr><th style="text-align:left">Description</th><th style="text-align:right">Qty</th><th style="text-align:right">Amount</th></tr></thead>
<tbody>
${rows}
</tbody>
</table>
<p><strong>Total: ${escapeHtml(formatMoney(invoice.total, invoice.currency))}</strong></p>
<p>Amount due: ${escapeHtml(formatMoney(invoice.amount_due, invoice.currency))} · Amount paid: ${escapeHtml(formatMoney(invoice.amount_paid, invoice.currency))}</p>
<p><a href="${escapeHtml(invoice.invoice_pdf ?? '#')}">Download PDF</a></p>
</body>
</html>
`;
}

function pdfText(text: string): string {
  const ascii = text
    .replace(/×/g, 'x')
    .replace(/·/g, '-')
    .replace(/[^\x20-\x7e]/g, '?');
  return ascii.replace(/[\\()]/g, (c) => `\\${c}`);
}

/** A valid single-page PDF 1.4 with the invoice in Helvetica; byte offsets in the xref are exact. */
export function renderInvoicePdf(invoice: FakeInvoice): Buffer {
  const lines = [
    ...summaryLines(invoice),
    '',
    ...invoice.lines.data.map((line) => `${line.description}    ${formatMoney(line.amount, line.currency)}`),
    '',
    `Total: ${formatMoney(invoice.total, invoice.currency)}`,
    `Amount due: ${formatMoney(invoice.amount_due, invoice.currency)}   Amount paid: ${formatMoney(invoice.amount_paid, invoice.currency)}`,
  ];
  const ops = ['BT', '/F1 11 Tf', '14 TL', '56 780 Td'];
  lines.forEach((line, i) => {
    if (i === 0) ops.push('/F1 16 Tf', `(${pdfText(line)}) Tj`, '/F1 11 Tf', 'T*');
    else ops.push(`(${pdfText(line)}) Tj`, 'T*');
  });
  ops.push('ET');
  const content = ops.join('\n');
  const objects = [
    '<< /Type /Catalog /Pages 2 0 R >>',
    '<< /Type /Pages /Kids [3 0 R] /Count 1 >>',
    '<< /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] /Resources << /Font << /F1 4 0 R >> >> /Contents 5 0 R >>',
    '<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica /Encoding /WinAnsiEncoding >>',
    `<< /Length ${Buffer.byteLength(content, 'latin1')} >>\nstream\n${content}\nendstream`,
  ];
  let out = '%PDF-1.4\n';
  const offsets: number[] = [];
  objects.forEach((body, i) => {
    offsets.push(Buffer.byteLength(out, 'latin1'));
    out += `${i + 1} 0 obj\n${body}\nendobj\n`;
  });
  const xrefAt = Buffer.byteLength(out, 'latin1');
  out += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n`;
  for (const offset of offsets) out += `${String(offset).padStart(10, '0')} 00000 n \n`;
  out += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xrefAt}\n%%EOF\n`;
  return Buffer.from(out, 'latin1');
}
