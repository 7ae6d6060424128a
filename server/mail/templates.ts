/**
 * The e-mails of the review workflow. Texts people wrote (comments, review messages) go into the
 * plain-text part verbatim and into the HTML part escaped, so no markup or script from a comment
 * ever reaches a mail client as HTML. Every mail about a study carries the safety caution.
 */
import { SAFETY_CAUTION } from '../../shared/review/risk.ts';

/** Escapes the five HTML-significant characters. */
export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

export interface NotificationMailInput {
  /** First line, already plain words ("Tobin Achterberg asks you to review …"). */
  headline: string;
  /** Lines of fact under the headline, in words (a revision's violations and the worst one). */
  details?: string[];
  /** Text a person wrote (comment, review message), if any. */
  quote?: string;
  /** Link into the app. */
  link: string;
}

/** The safety caution every mail about a study carries (the same words as beside every result). */
const CAUTION = SAFETY_CAUTION;

/** Plain-text and HTML bodies of a notification e-mail. */
export function notificationMail({ headline, details = [], quote, link }: NotificationMailInput): { text: string; html: string } {
  const text = [headline, '', ...(details.length > 0 ? [...details, ''] : []), ...(quote ? [quote.split('\n').map((l) => `> ${l}`).join('\n'), ''] : []), `Open the study: ${link}`, '', CAUTION].join('\n');
  const html = [
    `<p>${escapeHtml(headline)}</p>`,
    ...details.map((d) => `<p><strong>${escapeHtml(d)}</strong></p>`),
    ...(quote ? [`<blockquote style="white-space:pre-wrap">${escapeHtml(quote)}</blockquote>`] : []),
    `<p><a href="${escapeHtml(link)}">Open the study</a></p>`,
    `<p style="color:#555;font-size:small">${escapeHtml(CAUTION)}</p>`,
  ].join('\n');
  return { text, html };
}
