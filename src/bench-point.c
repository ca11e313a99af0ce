/* bench-point.c - operating points in the bench file: a list of objects,
 * each a name and its changes as text, read strictly (unknown keys, wrong
 * types and malformed changes name the point) and written back as read. */
#include <config.h>

#include <string.h>

#include "bench-point.h"
#include "core-point.h"
#include "util-err.h"

static int
read_one(json_t *o, size_t i, struct point_list *l, char **cause)
{
	json_t *name = json_object_get(o, "name"), *ch = json_object_get(o, "changes"), *v;
	const char *key, *nm;
	struct point *p;
	size_t j;

	if (!json_is_object(o))
		return fail_with(cause, "points[%zu]: expected an object with name and changes", i);
	if (!json_is_string(name))
		return fail_with(cause, "points[%zu]: name: expected a string", i);
	nm = json_string_value(name);
	if (point_name_check(nm, cause) != 0)
		return -1;
	json_object_foreach(o, key, v)
		if (strcmp(key, "name") != 0 && strcmp(key, "changes") != 0)
			return fail_with(cause, "point '%s': unknown key '%s' (name, changes)",
			    nm, key);
	if (!json_is_array(ch) || json_array_size(ch) == 0)
		return fail_with(cause, "point '%s': changes: expected a non-empty array "
		    "of texts", nm);
	if (point_list_find(l, nm) != NULL)
		return fail_with(cause, "point '%s': name used twice", nm);
	p = point_list_push(l, nm);
	json_array_foreach(ch, j, v) {
		if (!json_is_string(v))
			return fail_with(cause, "point '%s': changes[%zu]: expected a text "
			    "like \"ID.KEY=VALUE\"", nm, j);
		if (point_change_check(json_string_value(v), cause) != 0) {
			cause_prefix(cause, "point '%s'", nm);
			return -1;
		}
		point_add_change(p, json_string_value(v));
	}
	return 0;
}

int
bench_points_from_json(json_t *v, struct bench *b, char **cause)
{
	struct point_list l = { NULL, 0, 0 };
	json_t *o;
	size_t i;

	if (!json_is_array(v))
		return fail_with(cause, "points: expected an array of points");
	json_array_foreach(v, i, o)
		if (read_one(o, i, &l, cause) != 0) {
			point_list_release(&l);
			return -1;
		}
	point_list_release(&b->points);
	b->points = l;
	return 0;
}

json_t *
bench_points_to_json(const struct bench *b)
{
	json_t *a;

	if (b->points.n == 0)
		return NULL;
	a = json_array();
	for (size_t i = 0; i < b->points.n; i++) {
		const struct point *p = &b->points.p[i];
		json_t *ch = json_array();

		for (size_t j = 0; j < p->n; j++)
			json_array_append_new(ch, json_string(p->change[j]));
		json_array_append_new(a, json_pack("{s:s, s:o}", "name", p->name, "changes", ch));
	}
	return a;
}
