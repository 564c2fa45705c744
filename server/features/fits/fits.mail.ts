const FOOTER = 'Kfield — hydraulic conductivity for monitoring-well networks. Slug-test K describes only the formation close to the screen; results support, and do not replace, the judgement of a licensed geologist or engineer.';
const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
const kText = (k: number) => `${k.toExponential(2)} m/s`;

function layout(title: string, lines: string[], link: { href: string; label: string }) {
  const text = [...lines, '', `${link.label}: ${link.href}`, '', FOOTER].join('\n');
  const html = `<!doctype html><html><body style="font-family:sans-serif;color:#0f172a"><h2 style="color:#135c56">${esc(title)}</h2>${lines
    .map((l) => `<p>${esc(l)}</p>`)
    .join('')}<p><a href="${esc(link.href)}">${esc(link.label)}</a></p><p style="color:#64748b;font-size:12px">${esc(FOOTER)}</p></body></html>`;
  return { text, html };
}

interface FitMailInfo {
  siteName: string;
  wellName: string;
  kMetersPerSecond: number;
  revision: number;
  link: string;
}

export function awaitingCheckMail(o: FitMailInfo & { preparer: string }) {
  return {
    subject: `Fit awaiting check: ${o.wellName} at ${o.siteName}`,
    ...layout(
      'A fit awaits your check',
      [`${o.preparer} submitted a fit of well ${o.wellName} (revision ${o.revision}, K = ${kText(o.kMetersPerSecond)}) at ${o.siteName} for checking.`],
      { href: o.link, label: 'Open the fit' },
    ),
  };
}

export function checkedMail(o: FitMailInfo & { checker: string; comment: string }) {
  return {
    subject: `Fit checked: ${o.wellName} at ${o.siteName}`,
    ...layout(
      'Your fit was checked',
      [
        `${o.checker} checked your fit of well ${o.wellName} (revision ${o.revision}, K = ${kText(o.kMetersPerSecond)}) at ${o.siteName}. It now counts toward the well's K.`,
        ...(o.comment ? [`Comment: ${o.comment}`] : []),
      ],
      { href: o.link, label: 'Open the fit' },
    ),
  };
}

export function sentBackMail(o: FitMailInfo & { checker: string; comment: string }) {
  return {
    subject: `Fit sent back: ${o.wellName} at ${o.siteName}`,
    ...layout(
      'Your fit was sent back',
      [`${o.checker} sent back your fit of well ${o.wellName} (revision ${o.revision}) at ${o.siteName} with this comment:`, o.comment],
      { href: o.link, label: 'Revise the fit' },
    ),
  };
}
