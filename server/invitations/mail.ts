import { ROLE_LABELS, type MatterRole } from '../../shared/roles';
import type { OutgoingMail } from '../mail/mailer';

const escapeHtml = (value: string) =>
  value.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c,
  );

export function invitationMail(input: {
  to: string;
  matterName: string;
  role: MatterRole;
  inviterName: string;
  link: string;
  expiresAt: string;
}): OutgoingMail {
  const role = ROLE_LABELS[input.role].toLowerCase();
  const expires = new Date(input.expiresAt).toUTCString();
  const text = [
    `${input.inviterName} invited you to the matter "${input.matterName}" on Quarry as ${role}.`,
    '',
    `Open this link to accept (it works once and expires ${expires}):`,
    input.link,
    '',
    'If you did not expect this invitation, you can ignore this message.',
  ].join('\n');
  const html = `<p>${escapeHtml(input.inviterName)} invited you to the matter <strong>${escapeHtml(
    input.matterName,
  )}</strong> on Quarry as ${escapeHtml(role)}.</p>
<p><a href="${escapeHtml(input.link)}">Accept the invitation</a> (the link works once and expires ${escapeHtml(expires)}).</p>
<p>If you did not expect this invitation, you can ignore this message.</p>`;
  return { to: input.to, subject: `Invitation to ${input.matterName} on Quarry`, text, html };
}
