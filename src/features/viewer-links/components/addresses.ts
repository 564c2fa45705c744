import { VIEWER_LINK_MAX_ADDRESSES, viewerLinkEmailBodySchema } from '@shared/schemas/viewer-links';

const addressSchema = viewerLinkEmailBodySchema.shape.to.element;

export type ReadAddresses = { addresses: string[]; error: null } | { addresses: string[]; error: string };

/**
 * The addresses typed or pasted into one box: separated by commas, semicolons, spaces or new
 * lines, each checked with the API's own rule, repeats dropped (ignoring case, as the server does).
 */
export function readAddresses(text: string): ReadAddresses {
  const seen = new Set<string>();
  const addresses: string[] = [];
  for (const part of text.split(/[\s,;]+/)) {
    if (!part) continue;
    const key = part.toLowerCase();
    if (seen.has(key)) continue;
    seen.add(key);
    addresses.push(part);
  }
  if (addresses.length === 0) return { addresses, error: 'Give at least one address' };
  const bad = addresses.filter((a) => !addressSchema.safeParse(a).success);
  if (bad.length > 0) {
    const list = bad.map((a) => `“${a}”`).join(', ');
    return { addresses, error: bad.length === 1 ? `${list} is not a valid e-mail address` : `${list} are not valid e-mail addresses` };
  }
  if (addresses.length > VIEWER_LINK_MAX_ADDRESSES) {
    return { addresses, error: `At most ${VIEWER_LINK_MAX_ADDRESSES} addresses at a time (${addresses.length} given)` };
  }
  return { addresses, error: null };
}
