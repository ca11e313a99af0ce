/* util-file.h - a whole file written at once: to a temporary file beside
 * it, synced, then renamed over it, so that a reader never sees half a
 * file and a failure leaves nothing behind.  cmd_write_atomic (cmd-store.c)
 * is this for text. */
#ifndef UTIL_FILE_H
#define UTIL_FILE_H

#include <stddef.h>

/* Refuses a path that is not a regular file, or one made read-only, as
 * writing in place would.  Returns 0, or -1 with *cause. */
int file_write_atomic(const char *path, const void *data, size_t len, char **cause);

#endif
