/* bench-file-scan.c - the fast way in for a valid bench file: the path is
 * cut into its elements by a small scanner and each element is read by
 * jansson alone, so a 10^5-element file never becomes one tree of 10^6
 * nodes (about 100 MB and most of the reading time).  Anything the scanner
 * is not sure of, and every error, goes back to the whole-tree reader,
 * which alone writes the messages: the two never disagree on what is
 * valid, only on how long it takes. */
#include <config.h>

#include <stdlib.h>
#include <string.h>

#include "bench-file.h"
#include "util-err.h"

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

/* Past the string opening at t[i] == '"'; 0 when it does not end.  *esc
 * is set when it holds a backslash. */
static size_t
skip_string(const char *t, size_t i, size_t n, int *esc)
{
	for (i++; i < n; i++) {
		if (t[i] == '\\') {
			*esc = 1;
			i++;
		} else if (t[i] == '"') {
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
		while (i < n && strchr(" \t\r\n,}]", t[i]) == NULL && t[i] != '\0')
			i++;
		return i;
	}
	while (i < n) {
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
		case '}':
		case ']':
			if (--depth == 0)
				return i + 1;
			break;
		}
		i++;
	}
	return 0;
}

/* Finds the top-level "path" array and every element in it.  Returns 0
 * with *path its brackets and *el (caller frees) the n element objects,
 * or -1 when the text is not plainly shaped so (the tree reader decides). */
static int
scan(const char *t, size_t n, struct span *path, struct span **el, size_t *nel)
{
	size_t i = skip_ws(t, 0, n), cap = 0;
	int found = 0;

	*el = NULL;
	*nel = 0;
	if (i >= n || t[i] != '{')
		return -1;
	for (i = skip_ws(t, i + 1, n); i < n && t[i] != '}'; ) {
		size_t k0 = i, k1;
		int esc = 0;

		if (t[i] != '"' || (k1 = skip_string(t, i, n, &esc)) == 0 || esc)
			goto fail;
		i = skip_ws(t, k1, n);
		if (i >= n || t[i] != ':')
			goto fail;
		i = skip_ws(t, i + 1, n);
		if (k1 - k0 == 6 && memcmp(t + k0, "\"path\"", 6) == 0) {
			if (found || i >= n || t[i] != '[')
				goto fail;
			found = 1;
			path->from = i;
			for (i = skip_ws(t, i + 1, n); i < n && t[i] != ']'; ) {
				size_t e = i;

				if (t[i] != '{' || (i = skip_value(t, i, n)) == 0)
					goto fail;
				if (*nel == cap) {
					cap = cap ? 2 * cap : 1024;
					*el = xreallocarray(*el, cap, sizeof **el);
				}
				(*el)[(*nel)++] = (struct span){ e, i };
				i = skip_ws(t, i, n);
				if (i < n && t[i] == ',') {
					i = skip_ws(t, i + 1, n);
					if (i >= n || t[i] != '{')
						goto fail;
				} else if (i >= n || t[i] != ']') {
					goto fail;
				}
			}
			if (i >= n)
				goto fail;
			path->to = ++i;
		} else if ((i = skip_value(t, i, n)) == 0) {
			goto fail;
		}
		i = skip_ws(t, i, n);
		if (i < n && t[i] == ',')
			i = skip_ws(t, i + 1, n);
		else if (i >= n || t[i] != '}')
			goto fail;
	}
	if (found)
		return 0;
fail:
	free(*el);
	*el = NULL;
	return -1;
}

struct bench *
bench_file_parse_fast(const char *text, size_t len)
{
	struct span path, *el;
	size_t nel, hlen;
	char *head;
	json_t *root;
	struct bench *b;
	char *cause = NULL;

	if (scan(text, len, &path, &el, &nel) != 0)
		return NULL;
	/* the file with an empty path: everything but the elements */
	hlen = path.from + 2 + (len - path.to);
	head = xmalloc(hlen);
	memcpy(head, text, path.from);
	memcpy(head + path.from, "[]", 2);
	memcpy(head + path.from + 2, text + path.to, len - path.to);
	root = json_loadb(head, hlen, JSON_REJECT_DUPLICATES, NULL);
	free(head);
	if (root == NULL) {
		free(el);
		return NULL;
	}
	b = model_bench_new(NULL);
	free(b->name);
	b->name = NULL;
	if (bench_head_from_json(root, b, &cause) != 0)
		goto bad;
	json_decref(root);
	root = NULL;
	if (nel > 0) {
		/* sized once: model_branch_push then never moves the array */
		b->path.el = xreallocarray(NULL, nel, sizeof *b->path.el);
		b->path.cap = nel;
	}
	for (size_t i = 0; i < nel; i++) {
		json_t *obj = json_loadb(text + el[i].from, el[i].to - el[i].from,
		    JSON_REJECT_DUPLICATES, NULL);
		int rc;

		if (obj == NULL)
			goto bad;
		/* as read_branch does for "path": depth 0, side branches allowed */
		rc = bench_element_from_json(obj, model_branch_push(&b->path), 1, 1, 0, &cause);
		json_decref(obj);
		if (rc != 0)
			goto bad;
	}
	if (model_validate(b, &cause) != 0)
		goto bad;
	free(el);
	return b;
bad:
	free(cause);
	json_decref(root);
	free(el);
	model_bench_free(b);
	return NULL;
}
