/* store-record.c - a bench as records (see store-db.c): its head (the
 * source and settings) and one record per element, shared by content, and
 * the layout text that lists them branch by branch; written from a bench
 * and read back into one.  What is stored is checked first, so that
 * nothing is stored that would not load again. */
#include <config.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "bench-file.h"
#include "store-impl.h"
#include "util-buf.h"
#include "util-err.h"

/* The id of the record holding json, inserting it when new. */
static long long
intern(struct store *s, enum store_q find, enum store_q insert, const char *json,
    char **cause)
{
	sqlite3_stmt *st = store_q(s, find, cause);
	long long id = 0;
	int rc;

	if (st == NULL)
		return 0;
	store_bind_text(st, 1, json);
	rc = sqlite3_step(st);
	if (rc == SQLITE_ROW) {
		id = sqlite3_column_int64(st, 0);
		store_q_done(st);
		return id;
	}
	store_q_done(st);
	if (rc != SQLITE_DONE) {
		store_fail(s, rc, cause, "looking up a record");
		return 0;
	}
	if ((st = store_q(s, insert, cause)) == NULL)
		return 0;
	store_bind_text(st, 1, json);
	rc = sqlite3_step(st);
	store_q_done(st);
	if (rc != SQLITE_DONE) {
		store_fail(s, rc, cause, "storing a record");
		return 0;
	}
	return sqlite3_last_insert_rowid(s->db);
}

static char *
head_json(const struct bench *b)
{
	json_t *o = bench_head_to_json(b);
	char *t;

	json_object_del(o, "format");
	json_object_del(o, "name");
	t = store_json_text(o);
	json_decref(o);
	return t;
}

static int
layout_branch(struct store *s, const struct branch *br, struct buf *out, char **cause)
{
	buf_addc(out, '[');
	for (size_t i = 0; i < br->n; i++) {
		const struct element *el = &br->el[i];
		json_t *o = bench_element_to_json(el, 0);
		char *t = store_json_text(o);
		long long id;

		json_decref(o);
		id = intern(s, Q_EL_FIND, Q_EL_INSERT, t, cause);
		free(t);
		if (id == 0)
			return -1;
		if (i > 0)
			buf_addc(out, ',');
		if (el->side_port == PORT_NONE) {
			buf_printf(out, "%lld", id);
			continue;
		}
		buf_printf(out, "[%lld,\"%s\",", id, model_port_name(el->side_port));
		if (layout_branch(s, &el->side, out, cause) != 0)
			return -1;
		buf_addc(out, ']');
	}
	buf_addc(out, ']');
	return 0;
}

/* Stores the records of a bench and fills st->head and st->layout. */
int
store_state_of(struct store *s, const struct bench *b, struct store_state *st, char **cause)
{
	char *h = head_json(b);
	struct buf lay;

	st->head = intern(s, Q_HEAD_FIND, Q_HEAD_INSERT, h, cause);
	free(h);
	if (st->head == 0)
		return -1;
	buf_init(&lay);
	if (layout_branch(s, &b->path, &lay, cause) != 0) {
		buf_release(&lay);
		return -1;
	}
	st->layout = buf_take(&lay);
	return 0;
}

static int
load_element(struct store *s, long long id, struct element *el, size_t depth,
    char **cause)
{
	sqlite3_stmt *st = store_q(s, Q_EL_GET, cause);
	json_error_t jerr;
	json_t *o;
	int rc;

	if (st == NULL)
		return -1;
	sqlite3_bind_int64(st, 1, id);
	rc = sqlite3_step(st);
	if (rc != SQLITE_ROW) {
		store_q_done(st);
		if (rc == SQLITE_DONE)
			return fail_with(cause, "element record %lld is missing", id);
		return store_fail(s, rc, cause, "reading an element");
	}
	o = json_loads((const char *)sqlite3_column_text(st, 0), 0, &jerr);
	store_q_done(st);
	if (o == NULL)
		return fail_with(cause, "element record %lld is not JSON: %s", id, jerr.text);
	rc = bench_element_from_json(o, el, 1, 0, depth, cause);
	json_decref(o);
	if (rc != 0)
		cause_prefix(cause, "element record %lld", id);
	return rc;
}

static int
port_parse(const char *t, enum port *p)
{
	for (enum port q = PORT_REFLECTED; q <= PORT_REJECTED; q++)
		if (t != NULL && strcmp(t, model_port_name(q)) == 0) {
			*p = q;
			return 0;
		}
	return -1;
}

static int
load_branch(struct store *s, json_t *arr, struct branch *br, size_t depth, char **cause)
{
	size_t i;
	json_t *v;

	if (!json_is_array(arr) || depth > MODEL_MAX_DEPTH)
		return fail_with(cause, "a layout is not an array of element ids");
	json_array_foreach(arr, i, v) {
		struct element *el = model_branch_push(br);
		json_t *idv = json_is_array(v) ? json_array_get(v, 0) : v;
		enum port p = PORT_NONE;

		if (!json_is_integer(idv))
			return fail_with(cause, "a layout item is not an element id");
		if (json_is_array(v) && (json_array_size(v) != 3 ||
		    port_parse(json_string_value(json_array_get(v, 1)), &p) != 0))
			return fail_with(cause, "a layout item is not [id, port, [...]]");
		if (load_element(s, json_integer_value(idv), el, depth, cause) != 0)
			return -1;
		if (p != PORT_NONE) {
			el->side_port = p;
			if (load_branch(s, json_array_get(v, 2), &el->side, depth + 1, cause) != 0)
				return -1;
		}
	}
	return 0;
}

struct bench *
store_state_load(struct store *s, const char *name, const struct store_state *st, char **cause)
{
	sqlite3_stmt *q = store_q(s, Q_HEAD_GET, cause);
	struct bench *b = NULL;
	json_error_t jerr;
	json_t *head = NULL, *lay = NULL;
	int rc;

	if (q == NULL)
		return NULL;
	sqlite3_bind_int64(q, 1, st->head);
	rc = sqlite3_step(q);
	if (rc != SQLITE_ROW) {
		store_q_done(q);
		if (rc == SQLITE_DONE)
			fail_with(cause, "head record %lld is missing", st->head);
		else
			store_fail(s, rc, cause, "reading a bench");
		goto fail;
	}
	head = json_loads((const char *)sqlite3_column_text(q, 0), 0, &jerr);
	store_q_done(q);
	if (!json_is_object(head)) {
		fail_with(cause, "head record %lld is not a JSON object", st->head);
		goto fail;
	}
	json_object_set_new(head, "format", json_string(MODEL_FORMAT));
	json_object_set_new(head, "name", json_string(name));
	b = model_bench_new(NULL);
	if (bench_head_from_json(head, b, cause) != 0)
		goto fail;
	lay = json_loads(st->layout, 0, &jerr);
	if (lay == NULL) {
		fail_with(cause, "a layout is not JSON: %s", jerr.text);
		goto fail;
	}
	if (load_branch(s, lay, &b->path, 0, cause) != 0 || model_validate(b, cause) != 0)
		goto fail;
	json_decref(head);
	json_decref(lay);
	return b;
fail:
	cause_prefix(cause, "database '%s': bench '%s'", s->path, name);
	json_decref(head);
	json_decref(lay);
	model_bench_free(b);
	return NULL;
}

/* model_validate checks what spans values; a value put in place without
 * model_set (range, finiteness) is checked here, so that nothing is stored
 * that would not load again. */
static int
value_check(struct element *el, struct element *parent, size_t depth, void *arg)
{
	struct element tmp;
	int rc = 0;

	(void)parent;
	(void)depth;
	model_element_init(&tmp, el->type, el->id);
	for (int k = 0; k < K_COUNT && rc == 0; k++)
		if (model_has(el, (enum model_key)k))
			rc = model_set(&tmp, (enum model_key)k, el->val[k], arg);
	model_element_release(&tmp);
	return rc;
}

int
store_bench_check(const struct bench *b, char **cause)
{
	if (model_validate(b, cause) != 0 ||
	    model_walk((struct branch *)&b->path, value_check, cause) != 0) {
		cause_prefix(cause, "bench '%s'", b->name);
		return -1;
	}
	return 0;
}
