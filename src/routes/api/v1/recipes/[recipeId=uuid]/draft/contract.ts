import { z } from 'zod';

export const saveDraftRequestSchema = z.strictObject({ base_revision: z.int().positive(), params: z.unknown() });
export type SaveDraftResponse = { revision: number };
