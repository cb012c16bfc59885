import { z } from 'zod';

/** `:id` route parameters: a positive integer (a bad one is a 400 naming `id`). */
export const idParam = z.object({ id: z.coerce.number().int().positive() });
