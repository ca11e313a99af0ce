/* util-buf.c - growable string buffer.  See util-buf.h. */
#include <config.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "util-buf.h"
#include "util-err.h"

void
buf_init(struct buf *b)
{
	b->cap = 64;
	b->s = xmalloc(b->cap);
	b->s[0] = '\0';
	b->len = 0;
}

void
buf_release(struct buf *b)
{
	free(b->s);
	b->s = NULL;
	b->len = b->cap = 0;
}

void
buf_reset(struct buf *b)
{
	b->len = 0;
	if (b->s != NULL)
		b->s[0] = '\0';
}

char *
buf_take(struct buf *b)
{
	char *s = b->s;

	/* Empty, and allocating nothing until the next append: every caller
	 * so far drops the buffer after taking its string. */
	b->s = NULL;
	b->len = b->cap = 0;
	return s;
}

void
buf_grow(struct buf *b, size_t extra)
{
	if (b->len + extra + 1 <= b->cap)
		return;
	if (b->cap == 0)
		b->cap = 64;
	while (b->len + extra + 1 > b->cap)
		b->cap *= 2;
	b->s = xrealloc(b->s, b->cap);
}

void
buf_vprintf(struct buf *b, const char *fmt, va_list ap)
{
	va_list aq;
	size_t room = b->cap - b->len;
	int n;

	/* Try the room there is first: most appends fit, and formatting
	 * twice is what a long report would spend its time on. */
	va_copy(aq, ap);
	n = vsnprintf(b->s + b->len, room, fmt, aq);
	va_end(aq);
	if (n < 0) {
		if (b->s != NULL)
			b->s[b->len] = '\0';
		return;
	}
	if ((size_t)n >= room) {
		buf_grow(b, (size_t)n);
		vsnprintf(b->s + b->len, (size_t)n + 1, fmt, ap);
	}
	b->len += (size_t)n;
}

void
buf_printf(struct buf *b, const char *fmt, ...)
{
	va_list ap;

	va_start(ap, fmt);
	buf_vprintf(b, fmt, ap);
	va_end(ap);
}

size_t
utf8_cols(const char *s)
{
	size_t n = 0;

	for (; *s != '\0'; s++)
		if (((unsigned char)*s & 0xC0) != 0x80)
			n++;
	return n;
}

void
buf_pad(struct buf *b, size_t width, size_t from)
{
	size_t have = b->s != NULL ? utf8_cols(b->s + from) : 0;

	while (have++ < width)
		buf_addc(b, ' ');
}

int
utf8_valid(const char *str)
{
	const unsigned char *s = (const unsigned char *)str;

	if (s == NULL)
		return 1;
	while (*s != '\0') {
		unsigned c = *s, n, cp;

		if (c < 0x80) {
			s++;
			continue;
		}
		if (c >= 0xc2 && c <= 0xdf)
			n = 1, cp = c & 0x1f;
		else if (c >= 0xe0 && c <= 0xef)
			n = 2, cp = c & 0x0f;
		else if (c >= 0xf0 && c <= 0xf4)
			n = 3, cp = c & 0x07;
		else
			return 0;
		for (unsigned i = 1; i <= n; i++) {
			if ((s[i] & 0xc0) != 0x80)
				return 0;
			cp = cp << 6 | (s[i] & 0x3f);
		}
		if ((n == 2 && cp < 0x800) || (n == 3 && (cp < 0x10000 || cp > 0x10ffff)) ||
		    (cp >= 0xd800 && cp <= 0xdfff))
			return 0;
		s += n + 1;
	}
	return 1;
}
