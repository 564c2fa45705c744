export const DISCLAIMER = 'Kfield — results support, and do not replace, the judgement of a licensed geologist or engineer.';

export function Disclaimer({ className }: { className?: string }) {
  return <p className={className}>{DISCLAIMER}</p>;
}
