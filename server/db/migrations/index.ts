import { Initial1796164898955 } from './1796164898955-Initial';
import { ReadingIndexes1796180000000 } from './1796180000000-ReadingIndexes';

/** Every migration, in order. New migrations are generated into this folder and added here. */
export const migrations = [Initial1796164898955, ReadingIndexes1796180000000];
