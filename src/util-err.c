/* util-err.c - error causes and allocation wrappers.  See util-err.h. */
#include <config.h>

#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/mman.h>

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

/* Code points a terminal shows as nothing or as a plain space: controls
 * (but newline and tab), no-break and other special spaces, zero-width and
 * direction marks, the byte-order mark.  A message quoting them raw would
 * hide what is wrong, so they are written "U+FEFF". */
static int
invisible(unsigned long c)
{
	return (c < 0x20 && c != '\n' && c != '\t') || (c >= 0x7f && c <= 0xa0) ||
	    c == 0xad || c == 0x34f || c == 0x61c || c == 0x115f || c == 0x1160 ||
	    c == 0x180e || (c >= 0x2000 && c <= 0x200f) ||
	    (c >= 0x2028 && c <= 0x202f) || (c >= 0x205f && c <= 0x206f) ||
	    c == 0x3000 || c == 0x3164 || c == 0xfeff || c == 0xffa0 ||
	    (c >= 0xfff9 && c <= 0xfffb);
}

/* Decodes one well-formed UTF-8 sequence at s; 0 when it is not one. */
static size_t
utf8_decode(const unsigned char *s, unsigned long *c)
{
	size_t n, i;

	if (s[0] < 0x80) {
		*c = s[0];
		return 1;
	}
	n = s[0] >= 0xf0 && s[0] <= 0xf4 ? 4 : s[0] >= 0xe0 ? 3 : s[0] >= 0xc2 ? 2 : 0;
	if (n == 0 || (n == 3 && s[0] >= 0xf0))
		return 0;
	*c = s[0] & (0x7f >> n);
	for (i = 1; i < n; i++) {
		if ((s[i] & 0xc0) != 0x80)
			return 0;
		*c = *c << 6 | (s[i] & 0x3f);
	}
	if ((n == 3 && *c < 0x800) || (n == 4 && (*c < 0x10000 || *c > 0x10ffff)))
		return 0;
	return n;
}

char *
util_escape_invisible(const char *s)
{
	const unsigned char *p = (const unsigned char *)s;
	size_t n = strlen(s), out = 0;
	char *d = xmalloc(n * 6 + 1);     /* "U+XXXX" is at most 6 per byte */

	while (*p != '\0') {
		unsigned long c;
		size_t k = utf8_decode(p, &c);

		if (k == 0) {
			d[out++] = (char)*p++;  /* not UTF-8: the caller's bytes */
			continue;
		}
		if (invisible(c))
			out += (size_t)sprintf(d + out, "U+%04lX", c);
		else {
			memcpy(d + out, p, k);
			out += k;
		}
		p += k;
	}
	d[out] = '\0';
	return d;
}

int
vfail_with(char **cause, const char *fmt, va_list ap)
{
	char *raw;

	if (cause != NULL && *cause == NULL) {
		raw = xvasprintf(fmt, ap);
		*cause = util_escape_invisible(raw);
		free(raw);
	}
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
	s = util_escape_invisible(pre);
	free(pre);
	pre = s;
	s = xasprintf("%s: %s", pre, *cause);
	free(pre);
	free(*cause);
	*cause = s;
}

#define HUGE_PAGE ((size_t)2 << 20)
#define HUGE_FROM ((size_t)32 << 20)

void
huge_hint(void *p, size_t n)
{
#ifdef MADV_HUGEPAGE
	uintptr_t from = ((uintptr_t)p + HUGE_PAGE - 1) & ~(uintptr_t)(HUGE_PAGE - 1);
	uintptr_t to = ((uintptr_t)p + n) & ~(uintptr_t)(HUGE_PAGE - 1);

	if (n >= HUGE_FROM && to > from)
		(void)madvise((void *)from, to - from, MADV_HUGEPAGE);
#else
	(void)p;
	(void)n;
#endif
}

void *
huge_alloc(size_t *bytes)
{
	size_t n;
	void *p;

	if (*bytes > SIZE_MAX - HUGE_PAGE)
		return NULL;
	n = (*bytes + HUGE_PAGE - 1) & ~(HUGE_PAGE - 1);
	if (n < HUGE_FROM)
		n = HUGE_FROM;
	if ((p = aligned_alloc(HUGE_PAGE, n)) == NULL)
		return NULL;
	huge_hint(p, n);
	*bytes = n;
	return p;
}
