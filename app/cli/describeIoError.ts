/** One plain line for a file-system error (no stack, no errno jargon beyond the path). */
export function describeIoError(error: NodeJS.ErrnoException): string {
  const where = error.path ?? 'file';
  if (error.syscall === 'write') {
    switch (error.code) {
      case 'EISDIR':
        return `cannot write ${where}: it is a folder; give a file name`;
      case 'ENOENT':
        return `cannot write ${where}: its folder does not exist`;
      default:
    }
  }
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
