/** One plain line for a file-system error (no stack, no errno jargon beyond the path). */
export function describeIoError(error: NodeJS.ErrnoException): string {
  const where = error.path ?? 'file';
  switch (error.code) {
    case 'ENOENT':
      return `cannot open ${where}: no such file`;
    case 'EACCES':
    case 'EPERM':
      return `cannot access ${where}: permission denied`;
    case 'EISDIR':
      return `${where} is a folder, not a capture file`;
    case 'ENOSPC':
      return `cannot write ${where}: the disk is full`;
    default:
      return `${where}: ${error.message}`;
  }
}
