/** True messages for file-system failures while writing outputs. */

/** Why a file-system call failed, in words, from its error code. */
export function fsReason(e: unknown): string {
  const err = e as NodeJS.ErrnoException;
  switch (err?.code) {
    case 'EACCES':
    case 'EPERM':
      return 'permission denied';
    case 'EROFS':
      return 'the file system is read-only';
    case 'ENOSPC':
      return 'the disk is full';
    case 'EDQUOT':
      return 'the disk quota is used up';
    case 'ENAMETOOLONG':
      return 'a name is too long for the file system (255 bytes per name)';
    case 'ENOTDIR':
      return 'a part of the path is a file, not a folder';
    case 'ELOOP':
      return 'too many symbolic links';
    case 'EBUSY':
      return 'the folder is in use (a mount point?)';
    case 'EXDEV':
      return 'the link points to another file system';
    case 'EEXIST':
    case 'ENOTEMPTY':
      return 'another program created it meanwhile';
    case 'EISDIR':
      return 'it is a folder';
    case 'ENOENT':
      return 'a folder on the path does not exist';
    default:
      return err?.message ?? String(e);
  }
}

/** Error codes that come from the place written to, not from a bug. */
export function isFsUserProblem(e: unknown): boolean {
  const code = (e as NodeJS.ErrnoException)?.code;
  return (
    typeof code === 'string' &&
    /^(EACCES|EPERM|EROFS|ENOSPC|EDQUOT|ENAMETOOLONG|ENOTDIR|ELOOP|EBUSY|EXDEV|EEXIST|ENOTEMPTY|EISDIR|ENOENT|EIO|EMLINK|EINVAL)$/.test(
      code,
    )
  );
}
