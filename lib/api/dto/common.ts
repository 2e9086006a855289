import { z } from 'zod';

// Small builders shared by the DTO schemas (lib/api/dto/*): JSON after serialisation, so dates
// are ISO strings, money whole cents, volumes numbers in litres and in the co-op's unit.

export const int = () => z.number().int();
export const num = () => z.number();
export const str = () => z.string();
export const date = () => z.string().describe('ISO 8601 date-time');
export const day = () => z.string().describe('YYYY-MM-DD');
export const units = z.enum(['us', 'metric']);

/** A file field of a multipart/form-data upload (its bytes). */
export const uploadedFile = () => z.string().meta({ format: 'binary' });

/** A page of rows: `{ rows, total, page, pageSize }`. */
export const pageOf = <T extends z.ZodType>(row: T) =>
  z.object({ rows: z.array(row), total: int(), page: int(), pageSize: int() });

/** A page of items (tank, reservations, draws): `{ items, total, page, pageSize }`. */
export const itemsOf = <T extends z.ZodType>(item: T) =>
  z.object({ items: z.array(item), total: int(), page: int(), pageSize: int() });
