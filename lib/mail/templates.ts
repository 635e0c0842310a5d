import type { OutgoingMail } from './send';

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

function layout(title: string, paragraphs: string[], link: string, linkLabel: string): string {
  const body = paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join('');
  return `<!doctype html><html><body style="font-family:sans-serif;color:#0f172a"><h1 style="font-size:18px">${escapeHtml(title)}</h1>${body}<p><a href="${escapeHtml(link)}" style="color:#0f7874">${escapeHtml(linkLabel)}</a></p><p style="color:#64748b;font-size:12px">If the link does not open, copy this address into your browser: ${escapeHtml(link)}</p></body></html>`;
}

export function invitationMail(p: { to: string; cohortName: string; trainerName: string; link: string; expiresInDays: number }): OutgoingMail {
  const lines = [
    `${p.trainerName} invited you to the cohort "${p.cohortName}" on Cellwright, the robot-cell bench.`,
    `Open the link to choose your name and password. The link works once and expires in ${p.expiresInDays} days.`,
  ];
  return {
    to: p.to,
    subject: `Invitation to ${p.cohortName} on Cellwright`,
    text: `${lines.join('\n\n')}\n\n${p.link}\n`,
    html: layout('You are invited to Cellwright', lines, p.link, 'Accept the invitation'),
  };
}

export function passwordResetMail(p: { to: string; name: string; link: string; expiresInMinutes: number }): OutgoingMail {
  const lines = [
    `Hello ${p.name}, someone asked to reset the password of your Cellwright account.`,
    `Open the link to choose a new password. It works once and expires in ${p.expiresInMinutes} minutes. If you did not ask for this, ignore this message.`,
  ];
  return {
    to: p.to,
    subject: 'Reset your Cellwright password',
    text: `${lines.join('\n\n')}\n\n${p.link}\n`,
    html: layout('Reset your password', lines, p.link, 'Choose a new password'),
  };
}
