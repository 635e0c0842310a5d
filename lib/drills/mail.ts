import type { OutgoingMail } from '@/lib/mail/send';
import { env } from '@/lib/env';

/** Where a student opens an assignment (the drills pages). */
export function assignmentLink(assignmentId: string): string {
  return `${env().APP_URL.replace(/\/$/, '')}/drills/assignments/${assignmentId}`;
}

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** The e-mail a student gets when a drill is assigned to their cohort. */
export function drillAssignedMail(p: { to: string; name: string; drillTitle: string; cohortName: string; trainerName: string; opensAt: string; closesAt: string; link: string }): OutgoingMail {
  const when = (iso: string) => new Date(iso).toUTCString();
  const lines = [
    `Hello ${p.name}, ${p.trainerName} assigned the drill "${p.drillTitle}" to ${p.cohortName}.`,
    `It opens ${when(p.opensAt)} and closes ${when(p.closesAt)}. Your work is saved as you go; submit your diagnosis before it closes.`,
  ];
  return {
    to: p.to,
    subject: `New drill: ${p.drillTitle}`,
    text: `${lines.join('\n\n')}\n\n${p.link}\n`,
    html: `<!doctype html><html><body style="font-family:sans-serif;color:#0f172a"><h1 style="font-size:18px">${escapeHtml(p.drillTitle)}</h1>${lines
      .map((l) => `<p>${escapeHtml(l)}</p>`)
      .join('')}<p><a href="${escapeHtml(p.link)}" style="color:#0f7874">Open the drill</a></p><p style="color:#64748b;font-size:12px">If the link does not open, copy this address into your browser: ${escapeHtml(p.link)}</p></body></html>`,
  };
}
