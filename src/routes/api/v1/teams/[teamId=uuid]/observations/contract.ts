export type ObservationListItem = {
	id: string;
	name: string;
	array: string;
	antennas: number;
	fields: number;
	scans: number;
	sha256: string;
	uploadedBy: string | null;
	createdAt: string;
};
export type ObservationListResponse = { items: ObservationListItem[]; nextCursor: null };
export type ObservationUploadResponse = { id: string; name: string; sha256: string; warnings: { path: string; message: string }[] };
