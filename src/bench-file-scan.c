/* bench-file-scan.c - the fast way in for a valid bench file: a small
 * scanner walks the text once and reads each element of the path where
 * it meets it (the plainest straight into the model, the rest by jansson
 * alone), so a 10^5-element file never becomes one tree of 10^6 nodes
 * (about 100 MB and most of the reading time).  Anything the scanner
 * is not sure of, and every error, goes back to the whole-tree reader,
 * which alone writes the messages: the two never disagree on what is
 * valid, only on how long it takes. */
#include <config.h>

#include <errno.h>
#include <locale.h>
#include <math.h>
#include <stdlib.h>
#include <stdint.h>
#include <string.h>

#include "bench-file.h"
#include "core-tol.h"
#include "core-units.h"
#include "util-err.h"
#include "util-json.h"

/* Deeper nesting inside one element than any valid element has (side
 * branches stop at MODEL_MAX_DEPTH); past it, the tree reader decides. */
#define SCAN_MAX_NEST 64

struct span {
	size_t from, to;            /* text[from..to) */
};

static size_t
skip_ws(const char *t, size_t i, size_t n)
{
	while (i < n && (t[i] == ' ' || t[i] == '\n' || t[i] == '\r' || t[i] == '\t'))
		i++;
	return i;
}

/* Byte classes for the skipping loops: what ends a run of plain bytes in
 * a string (C_STR), outside strings in a container (C_NEST), and in a bare
 * token (C_TOKEN).  A table, so that a plain byte costs one load and one
 * test: the scanner passes over every byte of a long file. */
enum { C_STR = 1, C_NEST = 2, C_TOKEN = 4 };

static const unsigned char byte_class[256] = {
	[0] = C_TOKEN,
	['\t'] = C_TOKEN, ['\n'] = C_TOKEN, ['\r'] = C_TOKEN, [' '] = C_TOKEN,
	[','] = C_TOKEN,
	['"'] = C_STR | C_NEST, ['\\'] = C_STR,
	['{'] = C_NEST, ['['] = C_NEST,
	['}'] = C_NEST | C_TOKEN, [']'] = C_NEST | C_TOKEN,
};

static int
is_class(char c, unsigned cls)
{
	return (byte_class[(unsigned char)c] & cls) != 0;
}

/* Past the string opening at t[i] == '"'; 0 when it does not end.  *esc
 * is set when it holds a backslash. */
static size_t
skip_string(const char *t, size_t i, size_t n, int *esc)
{
	for (i++; i < n; i++) {
		while (i < n && !is_class(t[i], C_STR))
			i++;
		if (i >= n)
			break;
		if (t[i] == '\\') {
			*esc = 1;
			i++;
		} else {
			return i + 1;
		}
	}
	return 0;
}

/* Past the value starting at t[i]: a string, an object or array (brackets
 * matched, strings skipped), or a bare token.  0: no end found, or nested
 * too deep.  Whether the value is valid JSON is jansson's to say. */
static size_t
skip_value(const char *t, size_t i, size_t n)
{
	int depth = 0, esc = 0;

	if (i >= n)
		return 0;
	if (t[i] == '"')
		return skip_string(t, i, n, &esc);
	if (t[i] != '{' && t[i] != '[') {
		while (i < n && !is_class(t[i], C_TOKEN))
			i++;
		return i;
	}
	while (i < n) {
		while (i < n && !is_class(t[i], C_NEST))
			i++;
		if (i >= n)
			break;
		switch (t[i]) {
		case '"':
			if ((i = skip_string(t, i, n, &esc)) == 0)
				return 0;
			continue;
		case '{':
		case '[':
			if (++depth > SCAN_MAX_NEST)
				return 0;
			break;
		default:                /* '}' or ']' */
			if (--depth == 0)
				return i + 1;
			break;
		}
		i++;
	}
	return 0;
}

static int read_path_element(const char *t, size_t *i, size_t n, size_t from,
    struct bench *b, int plain_numbers);

/* Finds the top-level "path" array and reads every element in it into
 * b's path as it goes (one pass over the text).  Returns 0 with *path its
 * brackets, or -1 when the text is not plainly shaped so or an element is
 * not valid (the tree reader decides). */
static int
scan(const char *t, size_t n, struct span *path, struct bench *b, int plain_numbers)
{
	size_t i = skip_ws(t, 0, n);
	int found = 0;

	if (i >= n || t[i] != '{')
		return -1;
	for (i = skip_ws(t, i + 1, n); i < n && t[i] != '}'; ) {
		size_t k0 = i, k1;
		int esc = 0;

		if (t[i] != '"' || (k1 = skip_string(t, i, n, &esc)) == 0 || esc)
			return -1;
		i = skip_ws(t, k1, n);
		if (i >= n || t[i] != ':')
			return -1;
		i = skip_ws(t, i + 1, n);
		if (k1 - k0 == 6 && memcmp(t + k0, "\"path\"", 6) == 0) {
			if (found || i >= n || t[i] != '[')
				return -1;
			found = 1;
			path->from = i;
			for (i = skip_ws(t, i + 1, n); i < n && t[i] != ']'; ) {
				if (t[i] != '{' ||
				    read_path_element(t, &i, n, path->from, b, plain_numbers) != 0)
					return -1;
				i = skip_ws(t, i, n);
				if (i < n && t[i] == ',') {
					i = skip_ws(t, i + 1, n);
					if (i >= n || t[i] != '{')
						return -1;
				} else if (i >= n || t[i] != ']') {
					return -1;
				}
			}
			if (i >= n)
				return -1;
			path->to = ++i;
		} else if ((i = skip_value(t, i, n)) == 0) {
			return -1;
		}
		i = skip_ws(t, i, n);
		if (i < n && t[i] == ',')
			i = skip_ws(t, i + 1, n);
		else if (i >= n || t[i] != '}')
			return -1;
	}
	return found ? 0 : -1;
}

/* ---- one element's object, as jansson would build it ----
 * jansson's reader costs about 1.5 us for a small element, eight times
 * what building the same values costs: its character stream and string
 * buffers.  This reader takes the plain shape of JSON that bench files
 * are made of and builds the same json_t values (numbers as jansson
 * types them, keys in their order, duplicates refused); for anything
 * else (escapes, bytes past ASCII, control characters, deep nesting,
 * long numbers) it gives up and jansson reads that element. */
struct rd {
	const char *t;
	size_t      i, n;
	int         depth;
};

static json_t *rd_value(struct rd *);

static void
rd_ws(struct rd *r)
{
	r->i = skip_ws(r->t, r->i, r->n);
}

static int
is_digit(char c)
{
	return c >= '0' && c <= '9';
}

/* A string at t[i] == '"' with nothing to decode: *s and *len. */
static int
rd_string(struct rd *r, const char **s, size_t *len)
{
	for (size_t j = r->i + 1; j < r->n; j++) {
		unsigned char c = (unsigned char)r->t[j];

		if (c == '"') {
			*s = r->t + r->i + 1;
			*len = j - r->i - 1;
			r->i = j + 1;
			return 0;
		}
		if (c < 0x20 || c >= 0x80 || c == '\\')
			return -1;
	}
	return -1;
}

/* RFC 8259 §6; integers as JSON_INTEGER unless out of range, the rest as
 * JSON_REAL unless they overflow (jansson refuses both).  *real says which;
 * 0, or -1 (r->i unmoved) for what is not such a number. */
static int
scan_number(struct rd *r, int *real, long long *iv, double *dv)
{
	const char *t = r->t;
	size_t j = r->i, n = r->n;
	char tok[64], *end;

	*real = 0;
	if (j < n && t[j] == '-')
		j++;
	if (j < n && t[j] == '0')
		j++;
	else if (j < n && t[j] >= '1' && t[j] <= '9')
		while (j < n && is_digit(t[j]))
			j++;
	else
		return -1;
	if (j < n && t[j] == '.') {
		*real = 1;
		if (++j >= n || !is_digit(t[j]))
			return -1;
		while (j < n && is_digit(t[j]))
			j++;
	}
	if (j < n && (t[j] == 'e' || t[j] == 'E')) {
		*real = 1;
		if (++j < n && (t[j] == '+' || t[j] == '-'))
			j++;
		if (j >= n || !is_digit(t[j]))
			return -1;
		while (j < n && is_digit(t[j]))
			j++;
	}
	if (j - r->i >= sizeof tok)
		return -1;
	memcpy(tok, t + r->i, j - r->i);
	tok[j - r->i] = '\0';
	errno = 0;
	if (!*real) {
		*iv = strtoll(tok, &end, 10);
		if (errno == ERANGE)
			return -1;
	} else if (json_number_exact(tok, j - r->i, dv) != 0) {
		*dv = strtod(tok, &end);
		if ((*dv == HUGE_VAL || *dv == -HUGE_VAL) && errno == ERANGE)
			return -1;
	}
	r->i = j;
	return 0;
}

static json_t *
rd_number(struct rd *r)
{
	long long iv;
	double dv;
	int real;

	if (scan_number(r, &real, &iv, &dv) != 0)
		return NULL;
	return real ? json_real(dv) : json_integer(iv);
}

static json_t *
rd_word(struct rd *r, const char *w, size_t len, json_t *v)
{
	if (r->n - r->i < len || memcmp(r->t + r->i, w, len) != 0)
		return NULL;
	r->i += len;
	return v;
}

/* The members of an object or the items of an array, after its bracket. */
static json_t *
rd_container(struct rd *r, int object)
{
	json_t *c = object ? json_object() : json_array();
	const char close = object ? '}' : ']';

	if (c == NULL || ++r->depth > SCAN_MAX_NEST)
		goto bad;
	r->i++;
	rd_ws(r);
	if (r->i < r->n && r->t[r->i] == close) {
		r->i++;
		r->depth--;
		return c;
	}
	for (;;) {
		const char *key = NULL;
		size_t klen = 0;
		json_t *v;

		if (object) {
			if (r->i >= r->n || r->t[r->i] != '"' || rd_string(r, &key, &klen) != 0)
				goto bad;
			rd_ws(r);
			if (r->i >= r->n || r->t[r->i] != ':')
				goto bad;
			r->i++;
			rd_ws(r);
		}
		if ((v = rd_value(r)) == NULL)
			goto bad;
		if (object ? json_object_getn(c, key, klen) != NULL ||
		    json_object_setn_new_nocheck(c, key, klen, v) != 0 :
		    json_array_append_new(c, v) != 0) {
			if (object)
				json_decref(v);
			goto bad;
		}
		rd_ws(r);
		if (r->i < r->n && r->t[r->i] == ',') {
			r->i++;
			rd_ws(r);
			continue;
		}
		if (r->i < r->n && r->t[r->i] == close) {
			r->i++;
			r->depth--;
			return c;
		}
		goto bad;
	}
bad:
	json_decref(c);
	return NULL;
}

static json_t *
rd_value(struct rd *r)
{
	const char *s;
	size_t len;

	if (r->i >= r->n)
		return NULL;
	switch (r->t[r->i]) {
	case '{':	return rd_container(r, 1);
	case '[':	return rd_container(r, 0);
	case '"':	return rd_string(r, &s, &len) == 0 ? json_stringn_nocheck(s, len) : NULL;
	case 't':	return rd_word(r, "true", 4, json_true());
	case 'f':	return rd_word(r, "false", 5, json_false());
	case 'n':	return rd_word(r, "null", 4, json_null());
	default:	return rd_number(r);
	}
}

/* The element at text[sp]: by the reader above where it can, else by
 * jansson; NULL when it is not valid JSON. */
static json_t *
read_element(const char *text, struct span sp, int plain_numbers)
{
	struct rd r = { text, sp.from, sp.to, 0 };
	json_t *obj = plain_numbers ? rd_value(&r) : NULL;

	if (obj != NULL && r.i == sp.to)
		return obj;
	json_decref(obj);
	return json_loadb(text + sp.from, sp.to - sp.from, JSON_REJECT_DUPLICATES, NULL);
}

/* ---- the plainest elements, straight into the model ----
 * Most elements of a long file are an id, a type and a few numbers or
 * quantities, perhaps with a damage object of the same: building jansson
 * values for them only to read them back cost a quarter of the reading.
 * These are set as bench_element_from_json sets them (set_key_json's quiet
 * way: the same units_parse and model_set); anything else (a label, a
 * part, a side branch, a tolerance, another kind of key or value, an
 * escape, a duplicate key, any error) leaves the slot zeroed again and
 * returns -1, and the element goes the jansson way, which alone decides
 * and reports. */
#define PLAIN_MEMBERS 48            /* more keys than any element takes */
#define PLAIN_TEXT    96            /* ids, types, keys and quantities copied to a string */

struct member {
	const char *key, *s;        /* borrowed from the text; s: a string value */
	size_t      klen, slen;
	char        kind;           /* 'n' number, 's' string, 'o' object */
	double      num;            /* 'n': as json_number_value would give it */
};

/* The members of the object at r->t[r->i] == '{': values that are plain
 * strings, numbers, or (with dm given) objects: a "damage" object's own
 * plain members read into dm[*nd] where it stands, any other object only
 * skipped.  -1 on anything else, a duplicate key, or too many. */
static int
plain_members(struct rd *r, struct member *m, size_t *n, struct member *dm, size_t *nd)
{
	*n = 0;
	r->i++;
	rd_ws(r);
	if (r->i < r->n && r->t[r->i] == '}') {
		r->i++;
		return 0;
	}
	for (;;) {
		struct member *x = &m[*n];

		if (*n == PLAIN_MEMBERS || r->i >= r->n || r->t[r->i] != '"' ||
		    rd_string(r, &x->key, &x->klen) != 0)
			return -1;
		for (size_t j = 0; j < *n; j++)
			if (m[j].klen == x->klen && memcmp(m[j].key, x->key, x->klen) == 0)
				return -1;
		(*n)++;
		rd_ws(r);
		if (r->i >= r->n || r->t[r->i] != ':')
			return -1;
		r->i++;
		rd_ws(r);
		if (r->i >= r->n)
			return -1;
		if (r->t[r->i] == '"') {
			x->kind = 's';
			if (rd_string(r, &x->s, &x->slen) != 0)
				return -1;
		} else if (r->t[r->i] == '{') {
			x->kind = 'o';
			if (dm == NULL)
				return -1;
			if (x->klen == 6 && memcmp(x->key, "damage", 6) == 0) {
				if (plain_members(r, dm, nd, NULL, NULL) != 0)
					return -1;
			} else if ((r->i = skip_value(r->t, r->i, r->n)) == 0) {
				return -1;
			}
		} else {
			long long iv;
			double dv;
			int real;

			x->kind = 'n';
			if (scan_number(r, &real, &iv, &dv) != 0)
				return -1;
			x->num = real ? dv : (double)iv;
		}
		rd_ws(r);
		if (r->i < r->n && r->t[r->i] == ',') {
			r->i++;
			rd_ws(r);
			continue;
		}
		if (r->i < r->n && r->t[r->i] == '}') {
			r->i++;
			return 0;
		}
		return -1;
	}
}

static int
is_key(const struct member *m, const char *name)
{
	return m->klen == strlen(name) && memcmp(m->key, name, m->klen) == 0;
}

/* The key of model_keys[from..to) named as m's key, or -1: model_key_find
 * without a C string, and with a first-byte test before each comparison
 * (every element of a long file asks). */
static int
plain_key(const struct member *m, int from, int to)
{
	for (int k = from; k < to; k++) {
		const char *name = model_keys[k].name;

		if (name[0] == m->key[0] && strncmp(name, m->key, m->klen) == 0 &&
		    name[m->klen] == '\0')
			return k;
	}
	return -1;
}

/* tol_split's answer for the string s[0..len) (no NUL): does it hold the
 * tolerance sign or "+-"?  Without copying it or two strstr. */
static int
plain_has_tol(const char *s, size_t len)
{
	for (size_t i = 0; i + 1 < len; i++)
		if ((s[i] == '+' && s[i + 1] == '-') ||
		    (s[i] == TOL_SIGN[0] && s[i + 1] == TOL_SIGN[1]))
			return 1;
	return 0;
}

/* A string value (or key) as a C string in out[PLAIN_TEXT]; -1 when longer. */
static int
plain_copy(char *out, const char *s, size_t len)
{
	if (len >= PLAIN_TEXT)
		return -1;
	memcpy(out, s, len);
	out[len] = '\0';
	return 0;
}

/* set_key_json where its quiet_value succeeds, and only there. */
static int
plain_set(struct element *el, enum model_key k, const struct member *v)
{
	const struct model_key_def *d = &model_keys[k];
	char s[PLAIN_TEXT], *why = NULL, *cause = NULL;
	double x;
	int rc;

	if (d->kind != KIND_QUANTITY && d->kind != KIND_FRACTION && d->kind != KIND_ANGLE &&
	    d->kind != KIND_NUMBER)
		return -1;
	if (v->kind == 'n') {
		x = v->num == 0 ? 0.0 : v->num;
	} else if (v->kind == 's' && d->kind == KIND_QUANTITY) {
		if (plain_has_tol(v->s, v->slen) || plain_copy(s, v->s, v->slen) != 0)
			return -1;
		rc = units_parse(s, d->dim, &x, &why);
		free(why);
		if (rc != 0)
			return -1;
	} else {
		return -1;
	}
	rc = model_set(el, k, x, &cause);
	free(cause);
	return rc;
}

/* The element object at text[from] into the zeroed slot el: 0 with *end
 * just past it, or -1 with el zeroed. */
static int
plain_element(const char *text, size_t from, size_t len, struct element *el, size_t *end)
{
	struct rd r = { text, from, len, 0 };
	struct member m[PLAIN_MEMBERS], dm[PLAIN_MEMBERS];
	const struct member *id = NULL, *type = NULL, *dmg = NULL;
	char idtext[PLAIN_TEXT], s[PLAIN_TEXT];
	size_t n, nd = 0;
	enum elem_type t;

	if (plain_members(&r, m, &n, dm, &nd) != 0)
		return -1;
	for (size_t i = 0; i < n; i++) {
		if (is_key(&m[i], "id"))
			id = &m[i];
		else if (is_key(&m[i], "type"))
			type = &m[i];
		else if (is_key(&m[i], "damage"))
			dmg = &m[i];
	}
	if (id == NULL || id->kind != 's' || id->slen == 0 ||
	    plain_copy(idtext, id->s, id->slen) != 0 ||
	    type == NULL || type->kind != 's' || plain_copy(s, type->s, type->slen) != 0 ||
	    model_type_parse(s, &t) != 0)
		return -1;
	if (dmg != NULL && dmg->kind != 'o')
		return -1;
	model_element_init(el, t, idtext);
	for (size_t i = 0; i < n; i++) {
		int k;

		if (&m[i] == id || &m[i] == type)
			continue;
		if (&m[i] == dmg) {
			/* read_damage: the damage keys by their short names */
			for (size_t j = 0; j < nd; j++) {
				k = dm[j].klen > 0 ? plain_key(&dm[j], K_DMG_FIRST, K_COUNT) : -1;
				if (k < 0 || plain_set(el, (enum model_key)k, &dm[j]) != 0)
					goto undo;
			}
			continue;
		}
		/* model_key_find's keys outside the damage object (a damage
		 * key's path here is no key of the plain way either) */
		if (m[i].klen == 0 || m[i].klen >= PLAIN_TEXT || is_key(&m[i], "label") ||
		    is_key(&m[i], "part") || is_key(&m[i], "reflected") ||
		    is_key(&m[i], "transmitted") || is_key(&m[i], "rejected"))
			goto undo;
		k = plain_key(&m[i], 0, K_DMG_FIRST);
		if (k < 0 || !model_key_applies((enum model_key)k, t) ||
		    plain_set(el, (enum model_key)k, &m[i]) != 0)
			goto undo;
	}
	*end = r.i;
	return 0;
undo:
	model_element_release(el);
	memset(el, 0, sizeof *el);
	return -1;
}

/* A path array of at least this much is worth 2 MB pages (util-err.h):
 * 4 MB of 4 kB pages took 2.3 ms to touch and 0.45 ms to hand back on
 * this kind of machine, the same in 2 MB pages 0.28 ms and 0.03 ms
 * (benches/bench_trace's 10^4 chain fills 3.8 MB). */
#define HUGE_WORTH ((size_t)2 << 20)

/* Elements a path array first holds: few enough to stay on the heap, and
 * enough to tell how many bytes an element takes. */
#define PATH_FIRST 64

/* Room for one more element in a path being read from text[from..n), *i
 * where the reading is.  The first time the array grows, the elements so
 * far tell how many the text holds (a quarter more, for safety); a path
 * that needs 2 MB or more gets a huge_alloc block of that at once, before
 * its pages are touched.  Otherwise, and past the guess, the array doubles
 * (past malloc's mmap threshold a larger block is the same pages mapped
 * again, mremap, not a copy). */
static void
path_room(struct branch *path, size_t from, size_t i, size_t n)
{
	size_t cap = path->cap ? 2 * path->cap : PATH_FIRST, bytes;
	struct element *el;

	if (path->cap == PATH_FIRST && i > from) {
		double guess = (double)path->n * (double)(n - from) / (double)(i - from) * 1.25;

		if (guess * sizeof *el >= HUGE_WORTH && guess < (double)(SIZE_MAX / sizeof *el) &&
		    (bytes = (size_t)guess * sizeof *el, el = huge_alloc(&bytes)) != NULL) {
			memcpy(el, path->el, path->n * sizeof *el);
			free(path->el);
			path->el = el;
			path->cap = bytes / sizeof *el;
			return;
		}
	}
	path->el = xreallocarray(path->el, cap, sizeof *path->el);
	path->cap = cap;
	huge_hint(path->el, cap * sizeof *path->el);
}

/* The element object at t[*i] into a new slot of b's path (whose text
 * starts at t[from]), *i past it: by plain_element where it can, else by
 * jansson and bench_element_from_json as read_branch does for "path"
 * (depth 0, side branches allowed).  -1 when it is not valid. */
static int
read_path_element(const char *t, size_t *i, size_t n, size_t from, struct bench *b,
    int plain_numbers)
{
	struct branch *path = &b->path;
	struct span sp = { *i, 0 };
	struct element *slot;
	json_t *obj;
	char *cause = NULL;
	int rc;

	if (path->n == path->cap)
		path_room(path, from, *i, n);
	slot = model_branch_push(path);
	if (plain_numbers && plain_element(t, *i, n, slot, i) == 0)
		return 0;
	if ((sp.to = skip_value(t, sp.from, n)) == 0 ||
	    (obj = read_element(t, sp, plain_numbers)) == NULL)
		return -1;
	rc = bench_element_from_json(obj, slot, 1, 1, 0, &cause);
	json_decref(obj);
	free(cause);
	*i = sp.to;
	return rc;
}

struct bench *
bench_file_parse_fast(const char *text, size_t len)
{
	struct span path;
	size_t hlen;
	char *head;
	json_t *root = NULL;
	struct bench *b = model_bench_new(NULL);
	char *cause = NULL;
	/* strtod reads "0.5" as jansson does only with a decimal point */
	int plain_numbers = strcmp(localeconv()->decimal_point, ".") == 0;

	free(b->name);
	b->name = NULL;
	if (scan(text, len, &path, b, plain_numbers) != 0)
		goto bad;
	/* the file with an empty path: everything but the elements */
	hlen = path.from + 2 + (len - path.to);
	head = xmalloc(hlen);
	memcpy(head, text, path.from);
	memcpy(head + path.from, "[]", 2);
	memcpy(head + path.from + 2, text + path.to, len - path.to);
	root = json_loadb(head, hlen, JSON_REJECT_DUPLICATES, NULL);
	free(head);
	if (root == NULL || bench_head_from_json(root, b, &cause) != 0)
		goto bad;
	json_decref(root);
	root = NULL;
	if (model_validate(b, &cause) != 0)
		goto bad;
	return b;
bad:
	free(cause);
	json_decref(root);
	model_bench_free(b);
	return NULL;
}
