import { useQuery } from '@tanstack/react-query';
import { NavLink } from 'react-router-dom';
import { checksQueryOptions } from '../api';

/** "Checks" in the top navigation, with the number of fits waiting for the signed-in person. */
export function ChecksNavLink({ className }: { className: (state: { isActive: boolean }) => string }) {
  const { data } = useQuery({ ...checksQueryOptions(), refetchInterval: 60_000 });
  const count = data?.length ?? 0;
  return (
    <NavLink to="/checks" className={className}>
      Checks
      {count > 0 ? (
        <span className="ml-1.5 inline-flex min-w-5 items-center justify-center rounded-full bg-amber-100 px-1.5 text-xs font-semibold text-amber-900 ring-1 ring-amber-200 ring-inset">
          <span className="sr-only">, waiting: </span>
          {count}
        </span>
      ) : null}
    </NavLink>
  );
}
