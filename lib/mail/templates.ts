import type { OutgoingMail } from './mailer';

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

function wrap(lines: string[], link?: { href: string; label: string }): { text: string; html: string } {
  const text = [...lines, ...(link ? ['', `${link.label}: ${link.href}`] : []), '', '— Tropopass'].join('\n');
  const html = `<div style="font-family:sans-serif;max-width:560px">${lines.map((l) => `<p>${esc(l)}</p>`).join('')}${
    link ? `<p><a href="${esc(link.href)}">${esc(link.label)}</a></p>` : ''
  }<p style="color:#667">— Tropopass</p></div>`;
  return { text, html };
}

export function signInLinkMail(to: string, url: string): OutgoingMail {
  return {
    to,
    subject: 'Your Tropopass sign-in link',
    ...wrap(
      [
        'Use this link within 10 minutes to sign in to Tropopass. It works once.',
        'If you did not ask for it, ignore this message.',
      ],
      {
        href: url,
        label: 'Sign in to Tropopass',
      },
    ),
  };
}

export function signUpConfirmMail(to: string, url: string): OutgoingMail {
  return {
    to,
    subject: 'Finish creating your Tropopass account',
    ...wrap(
      [
        'Your Tropopass account is ready. Use this link within 60 minutes to confirm the address and sign in. It works once.',
        'If you did not sign up, ignore this message.',
      ],
      {
        href: url,
        label: 'Confirm and sign in',
      },
    ),
  };
}

/** Sent instead of a new account when the address already has one, so the sign-up page says the same either way. */
export function signUpExistingMail(to: string, signInUrl: string, resetUrl: string): OutgoingMail {
  return {
    to,
    subject: 'Someone tried to create a Tropopass account with your address',
    ...wrap(
      [
        'Someone, perhaps you, tried to create a Tropopass account with this address, but it already has one. No new account was made.',
        `If it was you, sign in at ${signInUrl}, or choose a new password at ${resetUrl}.`,
        'If it was not you, nothing needs doing.',
      ],
      { href: signInUrl, label: 'Sign in to Tropopass' },
    ),
  };
}

export function passwordResetMail(to: string, url: string): OutgoingMail {
  return {
    to,
    subject: 'Reset your Tropopass password',
    ...wrap(
      [
        'Someone asked to reset the password of this Tropopass account. The link works once, within 30 minutes.',
        'If it was not you, ignore this message; your password stays as it is.',
      ],
      {
        href: url,
        label: 'Choose a new password',
      },
    ),
  };
}

export function invitationMail(
  to: string,
  input: { workspaceName: string; roleLabel: string; inviter: string; url: string },
): OutgoingMail {
  return {
    to,
    subject: `You are invited to ${input.workspaceName} on Tropopass`,
    ...wrap(
      [
        `${input.inviter} invited you to the workspace “${input.workspaceName}” as ${input.roleLabel}.`,
        'The invitation is valid for 7 days.',
      ],
      {
        href: input.url,
        label: 'Accept the invitation',
      },
    ),
  };
}
