/* util-file.c - writing a whole file through a temporary file and
 * rename(2).  The review's PDF goes out this way, from the command line
 * and from the workbench alike. */
#include <config.h>

#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "util-err.h"
#include "util-file.h"

int
file_write_atomic(const char *path, const void *data, size_t len, char **cause)
{
	const char *bytes = data;
	char *tmp;
	size_t off = 0;
	mode_t mask = umask(0), mode;
	struct stat sb;
	int fd;

	umask(mask);
	mode = 0666 & ~mask;
	/* rename(2) would replace a file its owner made read-only, or a
	 * non-file; keep to what writing in place would be allowed to do */
	if (stat(path, &sb) == 0) {
		if (!S_ISREG(sb.st_mode))
			return fail_with(cause, "%s: not a regular file; nothing written", path);
		if ((sb.st_mode & 0222) == 0 || access(path, W_OK) != 0)
			return fail_with(cause, "%s: the file is read-only; nothing written", path);
		mode = sb.st_mode & 07777;
	}
	tmp = xasprintf("%s.XXXXXX", path);
	fd = mkstemp(tmp);
	if (fd < 0) {
		fail_with(cause, "%s: cannot create a temporary file: %s; nothing written", path,
		    strerror(errno));
		free(tmp);
		return -1;
	}
	(void)fchmod(fd, mode);
	while (off < len) {
		ssize_t w = write(fd, bytes + off, len - off);

		if (w < 0 && errno == EINTR)
			continue;
		if (w <= 0)
			break;
		off += (size_t)w;
	}
	if (off < len || fsync(fd) != 0) {
		fail_with(cause, "%s: %s; nothing written", path, strerror(errno));
		close(fd);
		unlink(tmp);
		free(tmp);
		return -1;
	}
	if (close(fd) != 0 || rename(tmp, path) != 0) {
		fail_with(cause, "%s: %s; nothing written", path, strerror(errno));
		unlink(tmp);
		free(tmp);
		return -1;
	}
	free(tmp);
	return 0;
}
