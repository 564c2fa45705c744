/** `<site-slug>-<content>-<YYYY-MM-DD>.<ext>`: what an export holds, whose and when, in a plain ASCII file name. */
export function exportFileName(siteName: string, content: string, ext: string, now = new Date()): string {
  const slug =
    siteName
      .normalize('NFKD')
      .replace(/[\u0300-\u036f]/g, '')
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 60)
      .replace(/-+$/, '') || 'site';
  return `${slug}-${content}-${now.toISOString().slice(0, 10)}.${ext}`;
}

export const attachment = (fileName: string) => `attachment; filename="${fileName}"`;
