import type { Operation } from '../operation';
import { operations as accounts } from './accounts';
import { operations as billing } from './billing';
import { operations as brewing } from './brewing';
import { operations as core } from './core';
import { operations as imports } from './imports';
import { operations as lineage } from './lineage';
import { operations as tank } from './tank';

/** Every declared operation. A new domain file goes here; a new route goes into its domain's file. */
export const operations: Operation[] = [...core, ...accounts, ...tank, ...brewing, ...lineage, ...billing, ...imports];
