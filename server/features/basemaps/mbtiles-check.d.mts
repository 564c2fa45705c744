import type Database from 'better-sqlite3';
import type { BasemapMetadata } from '@shared/schemas/basemaps';

export class MbtilesError extends Error {}
export const KFIELD_APPLICATION_ID: number;
export const SQLITE_MAGIC: Buffer;
export function sniff(head: Buffer): string | null;
export function checkHead(head: Buffer): void;
export function isGzip(b: Uint8Array): boolean;
export function inflate(b: Buffer, maxOutputLength?: number): Buffer;
export function vectorTileLayerNames(raw: Uint8Array): string[];
export function checkSchema(db: Database.Database): { objects: { name: string; type: string }[]; columns: (table: string) => string[] };
export function readMetadata(db: Database.Database, maxBytes?: number): Record<string, string>;
export function checkTile(z: number, d: unknown, layers?: Set<string> | null, maxRawBytes?: number): Buffer;
export function deriveMetadata(meta: Record<string, string>, zooms: number[], seenLayers: Set<string>, gzipped: boolean): BasemapMetadata;
export function inspect(db: Database.Database): { byImageId: boolean; metadata: BasemapMetadata };
