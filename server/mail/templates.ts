import type { MailMessage } from './mailer';

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

function html(paragraphs: string[], link: { href: string; label: string }): string {
  const body = paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join('\n');
  return `<!doctype html><html><body style="font-family: sans-serif; line-height: 1.5">
${body}
<p><a href="${escapeHtml(link.href)}">${escapeHtml(link.label)}</a></p>
<p style="color:#555;font-size:90%">If you did not expect this e-mail, you can ignore it.</p>
</body></html>`;
}

/** The invitation to join a project. */
export function invitationMail(input: {
  to: string;
  inviterName: string;
  projectName: string;
  roleLabel: string;
  link: string;
  expiresAt: string;
}): MailMessage {
  const lines = [
    `${input.inviterName} invites you to join "${input.projectName}" on Maculo as ${input.roleLabel.toLowerCase()}.`,
    `Open the link below to set your password and join. The link works once and expires on ${input.expiresAt.slice(0, 10)}.`,
  ];
  return {
    to: input.to,
    subject: `Invitation to ${input.projectName} on Maculo`,
    text: `${lines.join('\n\n')}\n\n${input.link}\n\nIf you did not expect this e-mail, you can ignore it.\n`,
    html: html(lines, { href: input.link, label: 'Accept the invitation' }),
  };
}

/** A password reset link. */
export function passwordResetMail(input: {
  to: string;
  name: string;
  link: string;
  minutes: number;
}): MailMessage {
  const lines = [
    `Hello ${input.name},`,
    `Someone asked to reset the password of your Maculo account. Open the link below within ${input.minutes} minutes to choose a new password. The link works once.`,
  ];
  return {
    to: input.to,
    subject: 'Reset your Maculo password',
    text: `${lines.join('\n\n')}\n\n${input.link}\n\nIf you did not ask for this, you can ignore this e-mail; your password stays as it is.\n`,
    html: html(lines, { href: input.link, label: 'Choose a new password' }),
  };
}

/** Sent when an admin creates an account without a password. */
export function accountCreatedMail(input: {
  to: string;
  name: string;
  link: string;
  minutes: number;
}): MailMessage {
  const lines = [
    `Hello ${input.name},`,
    `An administrator created a Maculo account for you. Open the link below within ${Math.round(input.minutes / 60)} hours to choose your password.`,
  ];
  return {
    to: input.to,
    subject: 'Your Maculo account',
    text: `${lines.join('\n\n')}\n\n${input.link}\n`,
    html: html(lines, { href: input.link, label: 'Choose your password' }),
  };
}

/** The curators' digest of pending disputes and suggested duplicates. */
export function curateDigestMail(input: {
  to: string;
  name: string;
  projectName: string;
  disputes: number;
  suggestions: number;
  examples: string[];
  link: string;
}): MailMessage {
  const lines = [
    `Hello ${input.name},`,
    `In "${input.projectName}" there are ${input.disputes} disputed sighting${input.disputes === 1 ? '' : 's'} waiting for a decision and ${input.suggestions} suggested duplicate${input.suggestions === 1 ? '' : 's'} to check.`,
    ...input.examples.map((e) => `• ${e}`),
  ];
  return {
    to: input.to,
    subject: `Maculo: ${input.disputes} disputes and ${input.suggestions} possible duplicates in ${input.projectName}`,
    text: `${lines.join('\n\n')}\n\nOpen the Curate screen: ${input.link}\n`,
    html: html(lines, { href: input.link, label: 'Open the Curate screen' }),
  };
}
