import { CAUTIONS } from '@shared/cautions';

export function Cautions({ className }: { className?: string }) {
  return (
    <aside aria-label="Cautions" className={className}>
      <h3 className="text-xs font-semibold tracking-wide text-slate-600 uppercase">Cautions</h3>
      <div className="mt-1 space-y-1 text-xs leading-relaxed text-slate-600">
        {CAUTIONS.map((c) => (
          <p key={c}>{c}</p>
        ))}
      </div>
    </aside>
  );
}
