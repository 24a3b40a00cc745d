/** Where a dataset's audit trail is read (its members, curators and admins). */
export const auditTrailPath = (datasetId: number) => `/datasets/${datasetId}/audit`;
