/* util-buf.h - a growable string buffer, so that nothing is formatted into
 * a fixed array.  Embed a struct buf, buf_init it, append, then either
 * buf_release it or buf_take the string. */
#ifndef UTIL_BUF_H
#define UTIL_BUF_H

#include <stdarg.h>
#include <stddef.h>
#include <string.h>

struct buf {
	char   *s;          /* owned; always NUL-terminated after buf_init */
	size_t  len;
	size_t  cap;
};

void  buf_init(struct buf *);
void  buf_release(struct buf *);
void  buf_reset(struct buf *);                 /* empty, keep memory */
char *buf_take(struct buf *);                  /* caller frees; buf is reset */
/* Room for `extra` more bytes and the NUL (the slow half of the appends). */
void  buf_grow(struct buf *, size_t extra);
/* buf_add, buf_addn, buf_addc: inline below (a 10^5-element JSON trace
 * makes ten million appends, most of a few bytes). */
void  buf_printf(struct buf *, const char *fmt, ...)
          __attribute__((format(printf, 2, 3)));
void  buf_vprintf(struct buf *, const char *fmt, va_list)
          __attribute__((format(printf, 2, 0)));
void  buf_pad(struct buf *, size_t width_cols, size_t from);  /* pad with spaces to width, counting UTF-8 columns from offset `from` */

/* Columns a UTF-8 string takes on a terminal (every code point counts one:
 * the program prints no wide or combining characters of its own). */
size_t utf8_cols(const char *s);
/* 1 when s is well-formed UTF-8 (no overlongs, surrogates or bytes past
 * U+10FFFF), NULL included; text the program stores must be. */
int    utf8_valid(const char *s);

static inline void
buf_addn(struct buf *b, const char *s, size_t n)
{
	if (b->len + n + 1 > b->cap)
		buf_grow(b, n);
	memcpy(b->s + b->len, s, n);
	b->len += n;
	b->s[b->len] = '\0';
}

static inline void
buf_add(struct buf *b, const char *s)
{
	buf_addn(b, s, strlen(s));
}

static inline void
buf_addc(struct buf *b, char c)
{
	if (b->len + 2 > b->cap)
		buf_grow(b, 1);
	b->s[b->len++] = c;
	b->s[b->len] = '\0';
}

#endif
