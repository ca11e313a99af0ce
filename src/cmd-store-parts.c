/* cmd-store-parts.c - `beamledger parts list | add FILE | show NAME`: the
 * shelf of named components.  The parts file is "beamledger-parts-1":
 *   {"format": "beamledger-parts-1",
 *    "parts": [{"name": "m2in-1064-45", "type": "mirror", "aoi": 45, ...,
 *               "damage": {...}}, ...]}
 * Each part is an element of a bench file without "id" (and without
 * "part" or side branches); reading is as strict as for bench files, and a
 * file goes onto the shelf whole or not at all. */
#include <config.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cmd-store.h"
#include "core-diff.h"
#include "util-buf.h"
#include "util-err.h"

static int
parts_list(struct store *s)
{
	char **names, *cause = NULL;
	struct buf out;
	size_t n, w = 4;
	int rc = 0;

	if (store_parts(s, &names, &n, &cause) != 0)
		return cmd_fail(cause);
	buf_init(&out);
	for (size_t i = 0; i < n; i++)
		if (utf8_cols(names[i]) > w)
			w = utf8_cols(names[i]);
	if (n > 0)
		buf_printf(&out, "%-*s  type       label\n", (int)w, "part");
	for (size_t i = 0; i < n; i++) {
		struct element el;
		size_t start = out.len;

		if (rc == 0 && store_part_get(s, names[i], &el, &cause) != 0)
			rc = -1;
		if (rc == 0) {
			buf_add(&out, names[i]);
			buf_pad(&out, w + 2, start);
			buf_printf(&out, "%-9s  %s\n", model_type_name(el.type),
			    el.label != NULL ? el.label : "-");
			model_element_release(&el);
		}
		free(names[i]);
	}
	free(names);
	if (rc != 0) {
		buf_release(&out);
		return cmd_fail(cause);
	}
	if (n == 0)
		fprintf(stderr, PROG ": the parts shelf is empty; fill it with '" PROG
		    " parts add FILE'\n");
	rc = cmd_print(out.s);
	buf_release(&out);
	return rc;
}

static int
parts_show(struct store *s, const char *name)
{
	struct element el;
	struct buf out;
	char *cause = NULL;
	int rc;

	if (store_part_get(s, name, &el, &cause) != 0)
		return cmd_fail(cause);
	buf_init(&out);
	buf_printf(&out, "part:   %s\ntype:   %s\nlabel:  %s\nvalues: ", name,
	    model_type_name(el.type), el.label != NULL ? el.label : "-");
	cmd_values_line(&out, &el);
	buf_addc(&out, '\n');
	model_element_release(&el);
	rc = cmd_print(out.s);
	buf_release(&out);
	return rc;
}

int
cmd_parts(struct cmd_ctx *ctx, int argc, char **argv)
{
	struct store *s;
	char *cause = NULL;
	size_t n;
	int rc;

	if (argc < 2 || strcmp(argv[1], "--help") == 0) {
		if (argc < 2)
			return cmd_usage("parts: list, add FILE or show NAME?");
		printf("Usage: " PROG " parts list | parts add FILE | parts show NAME\n"
		    "The shelf of named parts.  A parts file is JSON:\n"
		    "  {\"format\": \"beamledger-parts-1\", \"parts\": [{\"name\": \"m2in-45\",\n"
		    "   \"type\": \"mirror\", \"aoi\": 45, \"reflectance\": 0.998,\n"
		    "   \"damage\": {\"cw_irradiance\": \"1 MW/cm^2\"}}]}\n"
		    "each part an element of a bench file without id; a label becomes the\n"
		    "label of elements placed from it.  A file goes on whole or not at all;\n"
		    "a name already there gets the new values (placed elements keep theirs).\n"
		    "Place a part with '" PROG " place BENCH TYPE ID --part NAME'.\n");
		return 0;
	}
	if (strcmp(argv[1], "list") == 0) {
		if (argc != 2)
			return cmd_usage("parts list: takes no operands ('%s')", argv[2]);
	} else if (strcmp(argv[1], "add") == 0 || strcmp(argv[1], "show") == 0) {
		if (argc != 3)
			return cmd_usage("parts %s: give one %s", argv[1],
			    argv[1][0] == 'a' ? "FILE" : "NAME");
	} else {
		return cmd_usage("parts: unknown subcommand '%s' (list, add, show)", argv[1]);
	}
	if ((s = cmd_store_open(ctx)) == NULL)
		return 2;
	if (strcmp(argv[1], "list") == 0) {
		rc = parts_list(s);
	} else if (strcmp(argv[1], "show") == 0) {
		rc = parts_show(s, argv[2]);
	} else if (store_parts_import(s, argv[2], &n, &cause) != 0) {
		rc = cmd_fail(cause);
	} else {
		printf("added %zu %s from %s\n", n, n == 1 ? "part" : "parts", argv[2]);
		rc = 0;
	}
	store_close(s);
	return rc;
}
