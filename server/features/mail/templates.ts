const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

const FOOTER = 'Kfield — hydraulic conductivity for monitoring-well networks.';

function layout(title: string, paragraphs: string[], link: { href: string; label: string }) {
  const text = [...paragraphs, '', `${link.label}: ${link.href}`, '', FOOTER].join('\n');
  const html = `<!doctype html><html><body style="font-family:sans-serif;color:#0f172a">
<h2 style="color:#135c56">${esc(title)}</h2>
${paragraphs.map((p) => `<p>${esc(p)}</p>`).join('\n')}
<p><a href="${esc(link.href)}">${esc(link.label)}</a></p>
<p style="color:#64748b;font-size:12px">${esc(FOOTER)}</p></body></html>`;
  return { text, html };
}

export function invitationMail(o: { siteName: string; role: string; invitedBy: string; link: string; expiresHours: number }) {
  return {
    subject: `You are invited to ${o.siteName} on Kfield`,
    ...layout(
      `Invitation to ${o.siteName}`,
      [
        `${o.invitedBy} invited you to the site "${o.siteName}" on Kfield with the ${o.role} role.`,
        `The link works once and expires in ${o.expiresHours} hours.`,
      ],
      { href: o.link, label: 'Accept the invitation' },
    ),
  };
}

export function passwordResetMail(o: { name: string; link: string; expiresHours: number }) {
  return {
    subject: 'Reset your Kfield password',
    ...layout(
      'Password reset',
      [
        `Hello ${o.name},`,
        `Someone asked to reset the password of your Kfield account. If it was you, choose a new password with the link below; it works once and expires in ${o.expiresHours} hour${o.expiresHours === 1 ? '' : 's'}.`,
        'If it was not you, ignore this message: your password stays as it is.',
      ],
      { href: o.link, label: 'Choose a new password' },
    ),
  };
}
