/** Where the technician's screens live; the Field work hub links to them. */
export const fieldRoutes = {
  hub: (projectId: string) => `/projects/${projectId}/field`,
  newTraverse: (projectId: string, sectionId: string) => `/projects/${projectId}/sections/${sectionId}/traverses/new`,
  traverse: (projectId: string, traverseId: string) => `/projects/${projectId}/traverses/${traverseId}`,
  terminals: (projectId: string) => `/projects/${projectId}/terminals`,
  instruments: () => "/instruments",
  instrument: (instrumentId: string) => `/instruments/${instrumentId}`,
};
