import { Foundation1764615600000 } from './1764615600000-foundation';

/** Every committed migration, oldest first. */
export const migrations = [Foundation1764615600000];
