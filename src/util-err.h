/* util-err.h - allocation that cannot fail quietly, and errors that carry
 * an allocated cause string.
 *
 * Expected failures (bad input, I/O, SQL) return -1 or NULL and fill an
 * optional `char **cause` with a malloc'd message; the caller shows and
 * frees it.  Out of memory is not expected: the x* wrappers run the hook
 * set by util_set_oom_hook (the UI uses it to restore the terminal), print
 * a message and exit with status 2. */
#ifndef UTIL_ERR_H
#define UTIL_ERR_H

#include <stdarg.h>
#include <stddef.h>

/* Sets *cause (when cause is not NULL and *cause is NULL) to a new message;
 * a cause already set is kept, since the first failure is the one to tell.
 * Always returns -1. */
int   fail_with(char **cause, const char *fmt, ...)
          __attribute__((format(printf, 2, 3)));
int   vfail_with(char **cause, const char *fmt, va_list ap)
          __attribute__((format(printf, 2, 0)));

/* Causes never hold invisible characters raw: controls (but newline and
 * tab), special spaces, zero-width and direction marks and the byte-order
 * mark are written "U+FEFF" by fail_with and cause_prefix. */
char *util_escape_invisible(const char *s);    /* caller frees */

/* Prepends "prefix: " to an existing cause (for adding the file name). */
void  cause_prefix(char **cause, const char *fmt, ...)
          __attribute__((format(printf, 2, 3)));

void *xmalloc(size_t);                          /* caller frees */
void *xcalloc(size_t, size_t);                  /* caller frees */
void *xrealloc(void *, size_t);                 /* caller frees */
void *xreallocarray(void *, size_t, size_t);    /* caller frees */
char *xstrdup(const char *);                    /* NULL gives NULL */
char *xasprintf(const char *fmt, ...)           /* caller frees */
          __attribute__((format(printf, 1, 2)));
char *xvasprintf(const char *fmt, va_list ap)   /* caller frees */
          __attribute__((format(printf, 1, 0)));

void  util_set_oom_hook(void (*hook)(void));

/* Large arrays and texts in 2 MB pages where the system grants them on
 * request: a fault costs about 2 us, 500 of them for every 2 MB of 4 kB
 * pages.  huge_alloc gives a block of at least *bytes (caller frees, with
 * free), aligned to and rounded up to 2 MB and at least 32 MiB, glibc's
 * highest mmap threshold, so that malloc maps it on its own and the hint
 * leaves with it (what is never touched costs nothing); *bytes is what it
 * holds.  NULL when the system will not: take the ordinary way.
 * huge_hint asks it for the whole 2 MB pages of a block malloc already
 * maps on its own (n >= 32 MiB), else does nothing.  Hints only. */
void *huge_alloc(size_t *bytes);
void  huge_hint(void *p, size_t n);

#endif
