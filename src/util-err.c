/* util-err.c - error causes and allocation wrappers.  See util-err.h. */
#include <config.h>

#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "util-err.h"

static void (*oom_hook)(void);

void
util_set_oom_hook(void (*hook)(void))
{
	oom_hook = hook;
}

static void
oom(void)
{
	if (oom_hook != NULL)
		oom_hook();
	fputs("beamledger: out of memory\n", stderr);
	exit(2);
}

void *
xmalloc(size_t n)
{
	void *p = malloc(n ? n : 1);

	if (p == NULL)
		oom();
	return p;
}

void *
xcalloc(size_t n, size_t size)
{
	void *p = calloc(n ? n : 1, size ? size : 1);

	if (p == NULL)
		oom();
	return p;
}

void *
xrealloc(void *p, size_t n)
{
	void *q = realloc(p, n ? n : 1);

	if (q == NULL)
		oom();
	return q;
}

void *
xreallocarray(void *p, size_t n, size_t size)
{
	if (size != 0 && n > SIZE_MAX / size)
		oom();
	return xrealloc(p, n * size);
}

char *
xstrdup(const char *s)
{
	size_t n;
	char *d;

	if (s == NULL)
		return NULL;
	n = strlen(s) + 1;
	d = xmalloc(n);
	memcpy(d, s, n);
	return d;
}

char *
xvasprintf(const char *fmt, va_list ap)
{
	va_list aq;
	int n;
	char *s;

	va_copy(aq, ap);
	n = vsnprintf(NULL, 0, fmt, aq);
	va_end(aq);
	if (n < 0)
		oom();
	s = xmalloc((size_t)n + 1);
	vsnprintf(s, (size_t)n + 1, fmt, ap);
	return s;
}

char *
xasprintf(const char *fmt, ...)
{
	va_list ap;
	char *s;

	va_start(ap, fmt);
	s = xvasprintf(fmt, ap);
	va_end(ap);
	return s;
}

int
vfail_with(char **cause, const char *fmt, va_list ap)
{
	if (cause != NULL && *cause == NULL)
		*cause = xvasprintf(fmt, ap);
	return -1;
}

int
fail_with(char **cause, const char *fmt, ...)
{
	va_list ap;

	va_start(ap, fmt);
	vfail_with(cause, fmt, ap);
	va_end(ap);
	return -1;
}

void
cause_prefix(char **cause, const char *fmt, ...)
{
	va_list ap;
	char *pre, *s;

	if (cause == NULL || *cause == NULL)
		return;
	va_start(ap, fmt);
	pre = xvasprintf(fmt, ap);
	va_end(ap);
	s = xasprintf("%s: %s", pre, *cause);
	free(pre);
	free(*cause);
	*cause = s;
}
