/** Export links: plain downloads the browser saves with the server's file name. */
export const planExportHref = (id: number, format: 'csv' | 'pdf') => `/api/plans/${id}/export.${format}`;
