export type { SharedRow, SharedListResponse } from '$lib/server/services/shared-list';
