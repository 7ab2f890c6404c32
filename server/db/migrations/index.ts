import { Initial1796164898955 } from './1796164898955-Initial';

/** Every migration, in order. New migrations are generated into this folder and added here. */
export const migrations = [Initial1796164898955];
