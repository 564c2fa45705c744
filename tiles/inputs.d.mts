export const DIST_DIR: string;
export const MBTILES_PATH: string;
export const STAMP_PATH: string;
export function inputsHash(): string;
export function staleReason(): string | null;
