import { randomBytes } from 'node:crypto';
import { rename, stat, unlink, writeFile } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';

/**
 * Writes a file so that readers see either the old content or the complete new one: write a
 * temporary file in the same folder, then rename it over the target (rename is atomic within one
 * file system on POSIX). The temporary file is removed if anything fails. A target that exists
 * and is not a regular file (/dev/null, a named pipe, a terminal) is written in place: renaming
 * over it would replace the device with a plain file.
 */
export async function writeFileAtomic(path: string, content: string): Promise<void> {
  const existing = await stat(path).catch(() => undefined);
  if (existing?.isDirectory()) throw writeError('EISDIR', path, `${path} is a folder`);
  if (existing !== undefined && !existing.isFile()) {
    await writeFile(path, content);
    return;
  }
  const temp = join(dirname(path), `.${basename(path)}.${randomBytes(6).toString('hex')}.tmp`);
  try {
    await writeFile(temp, content, { flag: 'wx' });
    await rename(temp, path);
  } catch (error) {
    await unlink(temp).catch(() => undefined);
    // The temporary name is ours, not the user's: errors name the file asked for.
    const e = error as NodeJS.ErrnoException;
    throw typeof e.code === 'string' ? writeError(e.code, path, e.message) : error;
  }
}

function writeError(code: string, path: string, message: string): NodeJS.ErrnoException {
  return Object.assign(new Error(message), { code, path, syscall: 'write' });
}
