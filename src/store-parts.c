/* store-parts.c - the parts shelf: named components (an element without an
 * id) kept as immutable versions, the shelf pointing at the current one,
 * and the parts file ("beamledger-parts-1") that fills it all or nothing. */
#include <config.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "bench-file.h"
#include "store-impl.h"
#include "util-buf.h"
#include "util-err.h"

#define PARTS_FORMAT "beamledger-parts-1"

/* A part is checked as the only element of a small bench, so that the
 * cross-field rules (reflectance xor rs/rp, a fluence with its pulse width,
 * required keys) apply to it as to any placed element. */
static int
part_validate(const char *name, const struct element *el, char **cause)
{
	struct bench *b = model_bench_new("part check");
	struct element copy;
	int rc;

	b->src.wavelength = 1064e-9;
	b->src.power = 1;
	b->src.waist[0] = b->src.waist[1] = 1e-3;
	model_element_copy(&copy, el);
	free(copy.id);
	copy.id = xstrdup(name);
	if (copy.type == EL_SPLITTER && copy.side_port == PORT_NONE)
		copy.side_port = PORT_REFLECTED;
	model_branch_insert(&b->path, 0, &copy);
	rc = model_validate(b, cause);
	model_bench_free(b);
	return rc;
}

static char *
part_json(const struct element *el)
{
	struct element copy;
	json_t *o;
	char *t;

	model_element_copy(&copy, el);
	free(copy.id);
	copy.id = xstrdup("");
	free(copy.part);
	copy.part = NULL;
	o = bench_element_to_json(&copy, 0);
	t = store_json_text(o);
	json_decref(o);
	model_element_release(&copy);
	return t;
}

static int
put_one(struct store *s, const char *name, const struct element *el, const char *now,
    char **cause)
{
	sqlite3_stmt *q;
	char *json;
	long long id = 0;
	int rc;

	if (name == NULL || name[0] == '\0')
		return fail_with(cause, "a part needs a name");
	if (el->side.n > 0)
		return fail_with(cause, "part '%s': a part has no side branch", name);
	if (part_validate(name, el, cause) != 0) {
		cause_prefix(cause, "part '%s'", name);
		return -1;
	}
	json = part_json(el);
	if ((q = store_q(s, Q_PART_VFIND, cause)) == NULL)
		goto fail;
	store_bind_text(q, 1, name);
	store_bind_text(q, 2, json);
	rc = sqlite3_step(q);
	if (rc == SQLITE_ROW)
		id = sqlite3_column_int64(q, 0);
	store_q_done(q);
	if (rc != SQLITE_ROW && rc != SQLITE_DONE) {
		store_fail(s, rc, cause, "finding a part");
		goto fail;
	}
	if (id == 0) {
		if ((q = store_q(s, Q_PART_VINSERT, cause)) == NULL)
			goto fail;
		store_bind_text(q, 1, name);
		store_bind_text(q, 2, json);
		store_bind_text(q, 3, now);
		rc = sqlite3_step(q);
		store_q_done(q);
		if (rc != SQLITE_DONE) {
			store_fail(s, rc, cause, "storing a part");
			goto fail;
		}
		id = sqlite3_last_insert_rowid(s->db);
	}
	if ((q = store_q(s, Q_PART_SET, cause)) == NULL)
		goto fail;
	store_bind_text(q, 1, name);
	sqlite3_bind_int64(q, 2, id);
	rc = sqlite3_step(q);
	store_q_done(q);
	if (rc != SQLITE_DONE) {
		store_fail(s, rc, cause, "storing a part");
		goto fail;
	}
	free(json);
	return 0;
fail:
	free(json);
	return -1;
}

int
store_parts_put(struct store *s, char *const *names, const struct element *els, size_t n,
    char **cause)
{
	char *now = store_now();
	int rc = 0;

	if (store_tx_begin(s, cause) != 0) {
		free(now);
		return -1;
	}
	for (size_t i = 0; i < n && rc == 0; i++)
		rc = utf8_valid(names[i]) ? put_one(s, names[i], &els[i], now, cause) :
		    fail_with(cause, "a part name must be UTF-8 text");
	free(now);
	return store_tx_end(s, rc, cause);
}

int
store_part_put(struct store *s, const char *name, const struct element *el, char **cause)
{
	char *names[1] = { (char *)name };

	return store_parts_put(s, names, el, 1, cause);
}

static int
part_from_json(const char *name, const char *text, struct element *out, char **cause)
{
	json_error_t jerr;
	json_t *o = json_loads(text, 0, &jerr);
	int rc;

	if (o == NULL)
		return fail_with(cause, "part '%s': the stored record is not JSON", name);
	/* a record without a type fails before the element is initialised:
	 * zero it so the release below frees nothing that is not ours */
	memset(out, 0, sizeof *out);
	rc = bench_element_from_json(o, out, 0, 0, 0, cause);
	json_decref(o);
	if (rc != 0) {
		model_element_release(out);
		cause_prefix(cause, "part '%s'", name);
		return -1;
	}
	free(out->part);
	out->part = xstrdup(name);
	return 0;
}

int
store_part_get(struct store *s, const char *name, struct element *out, char **cause)
{
	sqlite3_stmt *q = store_q(s, Q_PART_CURRENT, cause);
	char *json = NULL;
	int rc;

	if (q == NULL)
		return -1;
	store_bind_text(q, 1, name);
	rc = sqlite3_step(q);
	if (rc == SQLITE_ROW)
		json = xstrdup((const char *)sqlite3_column_text(q, 1));
	store_q_done(q);
	if (rc == SQLITE_DONE)
		return fail_with(cause, "part '%s' is not on the shelf", name);
	if (rc != SQLITE_ROW)
		return store_fail(s, rc, cause, "reading a part");
	rc = part_from_json(name, json, out, cause);
	free(json);
	return rc;
}

int
store_parts(struct store *s, char ***names, size_t *n, char **cause)
{
	sqlite3_stmt *q = store_q(s, Q_PART_LIST, cause);
	size_t cap = 0;
	int rc;

	*names = NULL;
	*n = 0;
	if (q == NULL)
		return -1;
	while ((rc = sqlite3_step(q)) == SQLITE_ROW) {
		if (*n == cap) {
			cap = cap ? 2 * cap : 16;
			*names = xreallocarray(*names, cap, sizeof **names);
		}
		(*names)[(*n)++] = xstrdup((const char *)sqlite3_column_text(q, 0));
	}
	store_q_done(q);
	if (rc != SQLITE_DONE) {
		for (size_t i = 0; i < *n; i++)
			free((*names)[i]);
		free(*names);
		*names = NULL;
		*n = 0;
		return store_fail(s, rc, cause, "listing parts");
	}
	return 0;
}

/* ---- snapshots: which shelf version each placed part came from ---- */

static int
collect_parts(struct element *el, struct element *parent, size_t depth, void *arg)
{
	json_t *names = arg;

	(void)parent;
	(void)depth;
	if (el->part != NULL && el->part[0] != '\0')
		json_object_set_new(names, el->part, json_null());
	return 0;
}

char *
store_parts_snapshot(struct store *s, const struct bench *b, const char *old_parts,
    char **cause)
{
	json_t *names = json_object(), *old = NULL, *v;
	const char *name;
	void *tmp;
	char *text;

	model_walk((struct branch *)&b->path, collect_parts, names);
	if (old_parts != NULL)
		old = json_loads(old_parts, 0, NULL);
	json_object_foreach_safe(names, tmp, name, v) {
		json_t *was = json_object_get(old, name);
		sqlite3_stmt *q;
		int rc;

		if (json_is_integer(was)) {
			json_object_set(names, name, was);
			continue;
		}
		if ((q = store_q(s, Q_PART_CURRENT, cause)) == NULL)
			goto fail;
		store_bind_text(q, 1, name);
		rc = sqlite3_step(q);
		if (rc == SQLITE_ROW)
			json_object_set_new(names, name, json_integer(sqlite3_column_int64(q, 0)));
		else
			json_object_del(names, name);
		store_q_done(q);
		if (rc != SQLITE_ROW && rc != SQLITE_DONE) {
			store_fail(s, rc, cause, "reading a part");
			goto fail;
		}
	}
	text = json_dumps(names, JSON_COMPACT | JSON_SORT_KEYS);
	json_decref(names);
	json_decref(old);
	return text != NULL ? text : xstrdup("{}");
fail:
	json_decref(names);
	json_decref(old);
	return NULL;
}

/* ---- the parts file ---- */

int
store_parts_import(struct store *s, const char *path, size_t *count, char **cause)
{
	json_error_t jerr;
	json_t *root = NULL, *arr, *fmt, *v;
	char *text, **names = NULL;
	struct element *els = NULL;
	const char *key;
	size_t len, i, n = 0;
	int rc = -1;

	*count = 0;
	if ((text = bench_slurp(path, &len, cause)) == NULL)
		return -1;
	root = json_loadb(text, len, JSON_REJECT_DUPLICATES, &jerr);
	free(text);
	if (root == NULL) {
		fail_with(cause, "%s:%d:%d: not valid JSON: %s", path, jerr.line, jerr.column,
		    jerr.text);
		return -1;
	}
	if (!json_is_object(root)) {
		fail_with(cause, "%s: a parts file holds one JSON object", path);
		goto done;
	}
	json_object_foreach(root, key, v)
		if (strcmp(key, "format") != 0 && strcmp(key, "parts") != 0) {
			fail_with(cause, "%s: unknown top-level key '%s' (format, parts)", path, key);
			goto done;
		}
	fmt = json_object_get(root, "format");
	if (!json_is_string(fmt) || strcmp(json_string_value(fmt), PARTS_FORMAT) != 0) {
		fail_with(cause, "%s: format: expected \"%s\"", path, PARTS_FORMAT);
		goto done;
	}
	arr = json_object_get(root, "parts");
	if (!json_is_array(arr)) {
		fail_with(cause, "%s: parts: expected an array of parts", path);
		goto done;
	}
	names = xcalloc(json_array_size(arr) + 1, sizeof *names);
	els = xcalloc(json_array_size(arr) + 1, sizeof *els);
	json_array_foreach(arr, i, v) {
		json_t *copy, *jn;

		if (!json_is_object(v)) {
			fail_with(cause, "%s: parts[%zu]: expected an object", path, i);
			goto done;
		}
		jn = json_object_get(v, "name");
		if (!json_is_string(jn) || json_string_length(jn) == 0) {
			fail_with(cause, "%s: parts[%zu]: name: expected a non-empty string", path, i);
			goto done;
		}
		for (size_t j = 0; j < n; j++)
			if (strcmp(names[j], json_string_value(jn)) == 0) {
				fail_with(cause, "%s: parts[%zu]: part '%s' is given twice", path,
				    i, names[j]);
				goto done;
			}
		if (json_object_get(v, "id") != NULL || json_object_get(v, "part") != NULL) {
			fail_with(cause, "%s: part '%s': a part has a name, not an id or part",
			    path, json_string_value(jn));
			goto done;
		}
		/* Read with the name as id, so that messages name the part. */
		copy = json_deep_copy(v);
		json_object_del(copy, "name");
		json_object_set(copy, "id", jn);
		names[n] = xstrdup(json_string_value(jn));
		rc = bench_element_from_json(copy, &els[n], 1, 0, 0, cause);
		json_decref(copy);
		n++;
		if (rc == 0)
			rc = part_validate(names[n - 1], &els[n - 1], cause);
		if (rc != 0) {
			cause_prefix(cause, "%s: parts[%zu]", path, i);
			goto done;
		}
		rc = -1;
	}
	rc = store_parts_put(s, names, els, n, cause);
	if (rc == 0)
		*count = n;
done:
	for (i = 0; i < n; i++) {
		free(names[i]);
		model_element_release(&els[i]);
	}
	free(names);
	free(els);
	json_decref(root);
	return rc;
}
