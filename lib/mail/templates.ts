/**
 * The shop's e-mails to its customers, each in plain text and HTML with the same words: a quote
 * offered, an invoice issued, a payment received, the job ready to collect, a balance card, a
 * re-issued balance card. Every one names the job, links to the customer's own page for it and
 * closes with the shop's signature.
 */

export const CUSTOMER_MAIL_KINDS = [
  "quote-offered",
  "invoice-issued",
  "payment-received",
  "ready-to-collect",
  "balance-card",
  "card-reissued",
] as const;
export type CustomerMailKind = (typeof CUSTOMER_MAIL_KINDS)[number];

/** How the owner's settings screen and the outbox name each message. */
export const CUSTOMER_MAIL_LABEL: Record<CustomerMailKind, string> = {
  "quote-offered": "Quote offered",
  "invoice-issued": "Invoice issued",
  "payment-received": "Payment received",
  "ready-to-collect": "Ready to collect",
  "balance-card": "Balance card",
  "card-reissued": "Re-issued balance card",
};

export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

interface Common {
  customerName: string;
  jobNumber: string;
  engine: string;
  /** The customer's page for the job (or its quote and invoice), on the app's public address. */
  link: string;
  shopName: string;
  /** The closing lines, already worked out from the shop's settings. */
  signature: string;
  /** A few words from the person sending it, after the greeting. */
  note?: string | null;
}

export type MailFacts =
  | (Common & { kind: "quote-offered"; quoteNumber: string; total: string })
  | (Common & { kind: "invoice-issued"; invoiceNumber: string; total: string })
  | (Common & {
      kind: "payment-received";
      invoiceNumber: string;
      amount: string;
      owed: string | null;
    })
  | (Common & { kind: "ready-to-collect"; promised: string | null })
  | (Common & {
      kind: "balance-card" | "card-reissued";
      revision: number;
      verifyUrl: string;
      /** Whether this revision is the current card, or which one replaced it. */
      standing?: string;
    });

function escapeHtml(text: string): string {
  return text
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

/** The body's paragraphs, before the link and the signature. */
function paragraphs(f: MailFacts): { subject: string; lines: string[]; linkText: string } {
  const job = `job ${f.jobNumber} (${f.engine})`;
  switch (f.kind) {
    case "quote-offered":
      return {
        subject: `Quote ${f.quoteNumber} for job ${f.jobNumber}`,
        lines: [
          `We have written a quote for ${job}: ${f.total} in all.`,
          "You can read it and accept it on your page for the job; we start the work once it is accepted.",
        ],
        linkText: "Read and accept the quote",
      };
    case "invoice-issued":
      return {
        subject: `Invoice ${f.invoiceNumber} for job ${f.jobNumber}`,
        lines: [
          `Here is the invoice for ${job}: ${f.total} to pay.`,
          "You can read it, download it and pay online on your page for the job, or pay at the counter.",
        ],
        linkText: "See and pay the invoice",
      };
    case "payment-received":
      return {
        subject: `Payment received for invoice ${f.invoiceNumber}`,
        lines: [
          `Thank you: we have received ${f.amount} for invoice ${f.invoiceNumber} (${job}).`,
          f.owed ? `Still to pay on this invoice: ${f.owed}.` : "The invoice is paid in full.",
        ],
        linkText: "See the invoice",
      };
    case "ready-to-collect":
      return {
        subject: `Job ${f.jobNumber} is ready to collect`,
        lines: [
          `Your parts for ${job} are balanced and ready to collect.`,
          "Your balance card and the invoice are on your page for the job.",
        ],
        linkText: "Your page for the job",
      };
    case "balance-card":
      return {
        subject: `Balance card for job ${f.jobNumber} (revision ${f.revision})`,
        lines: [
          `Attached is the balance card for ${job}, revision ${f.revision}.${f.standing ? ` ${f.standing}` : ""}`,
          `Anyone can confirm the card is genuine at ${f.verifyUrl}`,
          "Follow the engine maker's figures and instructions when you assemble and run the engine.",
        ],
        linkText: "Your page for the job",
      };
    case "card-reissued":
      return {
        subject: `Re-issued balance card for job ${f.jobNumber} (revision ${f.revision})`,
        lines: [
          `We have re-issued the balance card for ${job}: revision ${f.revision} is attached and replaces the card we sent before.`,
          "Please use this revision and set the earlier one aside.",
          `Anyone can confirm the card is genuine at ${f.verifyUrl}`,
          "Follow the engine maker's figures and instructions when you assemble and run the engine.",
        ],
        linkText: "Your page for the job",
      };
  }
}

/**
 * The message for one event, in plain text and HTML.
 *
 * @example
 * renderCustomerMail({ kind: "ready-to-collect", customerName: "Ossian Brae", jobNumber: "2026-0007",
 *   engine: "Cross-plane V8", link: "https://shop.example.test/jobs/7", shopName: "Invented Balancing",
 *   signature: "Invented Balancing", promised: null }).subject; // "Job 2026-0007 is ready to collect"
 */
export function renderCustomerMail(facts: MailFacts): MailContent {
  const { subject, lines, linkText } = paragraphs(facts);
  const greeting = `Hello ${facts.customerName},`;
  const note = facts.note?.trim() ? [facts.note.trim()] : [];
  const text = [
    greeting,
    "",
    ...[...note, ...lines].flatMap((l) => [l, ""]),
    `${linkText}: ${facts.link}`,
    "",
    facts.signature,
  ].join("\n");
  const html = [
    `<p>${escapeHtml(greeting)}</p>`,
    ...[...note, ...lines].map((l) => `<p>${escapeHtml(l).replace(/\n/g, "<br>")}</p>`),
    `<p><a href="${escapeHtml(facts.link)}">${escapeHtml(linkText)}</a></p>`,
    `<p>${escapeHtml(facts.signature).replace(/\n/g, "<br>")}</p>`,
  ].join("\n");
  return { subject, text, html };
}

/** The closing lines: the owner's signature, else the shop's name, phone and e-mail. */
export function signatureOf(
  shop: { shopName: string; phone: string | null; email: string | null },
  signature: string | null,
): string {
  if (signature?.trim()) return signature.trim();
  return [shop.shopName, shop.phone, shop.email].filter(Boolean).join("\n");
}
