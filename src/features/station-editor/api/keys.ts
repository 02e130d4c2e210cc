export const stationEditorKeys = {
  all: ['station-editor'] as const,
  audits: () => [...stationEditorKeys.all, 'audit'] as const,
  audit: (stationId: number) => [...stationEditorKeys.audits(), stationId] as const,
};
