export type { ObservationListItem } from '$lib/server/services/observations';
import type { ObservationListItem } from '$lib/server/services/observations';
export type ObservationListResponse = { items: ObservationListItem[]; nextCursor: null };
export type ObservationUploadResponse = { id: string; name: string; sha256: string; warnings: { path: string; message: string }[] };
