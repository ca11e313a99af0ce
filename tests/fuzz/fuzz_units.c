/* fuzz_units.c - libFuzzer harness for the unit parser and formatter.  The
 * first byte picks a dimension, the rest is the text.  What parses must
 * not be -0 and must come back identical from the shortest display form,
 * from the exact SI form and from the key table (model_set_text ->
 * model_value_text); units_format must take any double at any precision
 * without a crash.  Built by ./configure --enable-fuzz; see DEVELOPERS.md. */
#include <config.h>

#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "core-model.h"
#include "core-units.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

static void
finding(const char *what, const char *text, double v, const char *shown)
{
	fprintf(stderr, "fuzz_units: %s: '%s' -> %a -> '%s'\n", what, text, v,
	    shown != NULL ? shown : "");
	abort();
}

static void
back_again(const char *how, const char *text, double v, enum unit_dim dim,
    const char *shown)
{
	double back = -42;
	char *cause = NULL;

	if (units_parse(shown, dim, &back, &cause) != 0) {
		fprintf(stderr, "%s\n", cause);
		finding(how, text, v, shown);
	}
	if (back != v)
		finding(how, text, v, shown);
}

/* The same text through the key table, for a key of this dimension. */
static void
through_keys(const char *text, enum unit_dim dim)
{
	for (int k = 0; k < K_COUNT; k++) {
		const struct model_key_def *d = &model_keys[k];
		struct element el;
		char *cause = NULL, *shown;
		int t;

		if (d->kind == KIND_QUANTITY ? d->dim != dim : dim != DIM_NONE)
			continue;
		for (t = 0; t < EL_NTYPES && !model_key_applies((enum model_key)k,
		    (enum elem_type)t); t++)
			;
		model_element_init(&el, (enum elem_type)t, "E1");
		if (model_set_text(&el, (enum model_key)k, text, &cause) == 0) {
			double v = el.val[k];

			if (!isfinite(v) || (v == 0 && signbit(v)))
				finding("the key table took a value it should not", text, v, NULL);
			shown = model_value_text(&el, (enum model_key)k);
			model_unset(&el, (enum model_key)k);
			if (model_set_text(&el, (enum model_key)k, shown, &cause) != 0 ||
			    el.val[k] != v)
				finding("model_value_text does not read back", text, v, shown);
			free(shown);
		}
		free(cause);
		model_element_release(&el);
	}
}

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	enum unit_dim dim;
	char *text, *cause = NULL, buf[128];
	double v = -42;

	if (size < 1 || size > 4096)
		return 0;
	dim = (enum unit_dim)(data[0] % DIM_COUNT);
	text = malloc(size);
	if (text == NULL)
		return 0;
	memcpy(text, data + 1, size - 1);
	text[size - 1] = '\0';
	if (units_parse(text, dim, &v, &cause) != 0) {
		if (cause == NULL)
			finding("refused without a cause", text, v, NULL);
		free(cause);
	} else {
		if (!isfinite(v) || (v == 0 && signbit(v)))
			finding("parsed to a value it should not", text, v, NULL);
		for (int ascii = 0; ascii < 2; ascii++) {
			units_format_shortest(buf, sizeof buf, v, dim, ascii);
			back_again("shortest form does not read back", text, v, dim, buf);
		}
		units_format_exact(buf, sizeof buf, v, dim);
		back_again("exact form does not read back", text, v, dim, buf);
		for (int sig = 0; sig <= 18; sig++)
			units_format(buf, sizeof buf, v, dim, sig, sig & 1);
	}
	through_keys(text, dim);
	/* the bytes as a double too: formatting must take any of them */
	if (size >= 9) {
		double x;

		memcpy(&x, data + 1, sizeof x);
		for (int sig = 1; sig <= 17; sig += 4)
			units_format(buf, sizeof buf, x, dim, sig, sig & 1);
		units_format_shortest(buf, sizeof buf, x, dim, 0);
		units_format_exact(buf, sizeof buf, x, dim);
	}
	free(text);
	return 0;
}
