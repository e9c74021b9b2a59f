/** The id of the traverse results' verdict line, the same in the server's drawing and the tablet's. */
export const resultsHeadingId = (traverseId: string) => `traverse-${traverseId}-verdict`;
