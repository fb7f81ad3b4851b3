/** A problem with the file as a whole: wrong type, too large, empty, too many rows, a malformed or oversized archive. */
export class FileProblem extends Error {}
