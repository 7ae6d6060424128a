/**
 * The account e-mails of sign-up: the link that finishes it, or the note that the address already
 * has an account (sent instead, so the sign-up form answers the same either way). They belong to
 * no team, so no owner reads them on the Outgoing mail page; with the local SMTP server they are
 * stored under DATA_DIR/mail like every message.
 */
import { escapeHtml } from './templates.ts';

/** The team id of mail that belongs to no team. */
export const NO_TEAM = '';

export function confirmSignUpMail({ name, teamName, link, expiresAt }: { name: string; teamName: string; link: string; expiresAt: Date }) {
  const text = [
    `Hello ${name},`,
    '',
    `Finish creating your Wyeward account and the team "${teamName}" with this link (it works once, until ${expiresAt.toUTCString()}):`,
    link,
    '',
    'If you did not sign up, ignore this message; no account is made.',
  ].join('\n');
  const html = [
    `<p>Hello ${escapeHtml(name)},</p>`,
    `<p>Finish creating your Wyeward account and the team “${escapeHtml(teamName)}” with this link (it works once, until ${escapeHtml(expiresAt.toUTCString())}):</p>`,
    `<p><a href="${escapeHtml(link)}">Finish signing up</a></p>`,
    '<p>If you did not sign up, ignore this message; no account is made.</p>',
  ].join('\n');
  return { subject: 'Finish creating your Wyeward account', text, html };
}

export function accountExistsMail({ name, signInLink }: { name: string; signInLink: string }) {
  const text = [
    `Hello ${name},`,
    '',
    'Someone (perhaps you) tried to create a new Wyeward account with this e-mail address, but you already have one. No new account was made.',
    '',
    `Sign in here: ${signInLink}`,
    '',
    'If this was not you, you need not do anything.',
  ].join('\n');
  const html = [
    `<p>Hello ${escapeHtml(name)},</p>`,
    '<p>Someone (perhaps you) tried to create a new Wyeward account with this e-mail address, but you already have one. No new account was made.</p>',
    `<p><a href="${escapeHtml(signInLink)}">Sign in</a></p>`,
    '<p>If this was not you, you need not do anything.</p>',
  ].join('\n');
  return { subject: 'You already have a Wyeward account', text, html };
}
