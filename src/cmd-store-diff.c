/* cmd-store-diff.c - `beamledger compare BENCH SETUP [SETUP]`: what changed
 * in the chain between two states of a bench and what it did to the damage
 * margins.  core-diff computes, report-diff formats; this file only loads
 * the two sides and prints. */
#include <config.h>

#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cmd-store.h"
#include "core-diff.h"
#include "report-diff.h"
#include "util-err.h"

int
cmd_compare(struct cmd_ctx *ctx, int argc, char **argv)
{
	static const struct option opts[] = {
		{ "format", required_argument, NULL, 'f' },
		{ "help", no_argument, NULL, 'h' },
		{ NULL, 0, NULL, 0 },
	};
	struct bench *side[2] = { NULL, NULL };
	char *shown[2] = { NULL, NULL }, *cause = NULL, *text;
	const char *name, *revs[2];
	struct store *s;
	struct diff *d;
	int ch, json = 0, rc;

	cmd_getopt_reset();
	while ((ch = getopt_long(argc, argv, "f:", opts, NULL)) != -1) {
		if (ch == 'f') {
			if (strcmp(optarg, "json") == 0)
				json = 1;
			else if (strcmp(optarg, "text") == 0 || strcmp(optarg, "table") == 0)
				json = 0;
			else
				return cmd_usage("compare: --format must be text or json, not '%s'",
				    optarg);
		} else if (ch == 'h') {
			printf("Usage: " PROG " compare BENCH SETUP [SETUP] [--format text|json]\n"
			    "What changed from the first SETUP to the second (default: the draft):\n"
			    "elements added, removed or moved, each value old -> new, the bench\n"
			    "settings; then the effect on the results per element (power, peak\n"
			    "irradiance or fluence, ratio to the threshold and status).\n"
			    "SETUP is a number (2 or #2), a name or draft.  Exit status: 0, or 2\n"
			    "on trouble.\n");
			return 0;
		} else {
			return cmd_usage("compare: unknown option or missing value in '%s'",
			    optind - 1 < argc ? argv[optind - 1] : "?");
		}
	}
	if (argc - optind < 2 || argc - optind > 3)
		return cmd_usage("compare: give BENCH, SETUP and optionally a second SETUP");
	name = argv[optind];
	revs[0] = argv[optind + 1];
	revs[1] = argc - optind == 3 ? argv[optind + 2] : "draft";
	if ((s = cmd_store_open_existing(ctx)) == NULL)
		return 2;
	for (int i = 0; i < 2; i++) {
		int no = 0;

		side[i] = cmd_rev_check(revs[i], &cause) == 0 ?
		    store_bench_load(s, name, revs[i], &no, &cause) : NULL;
		if (side[i] == NULL) {
			model_bench_free(side[0]);
			free(shown[0]);
			return cmd_store_fail(s, cause);
		}
		shown[i] = cmd_rev_shown(revs[i], no);
	}
	store_close(s);
	d = diff_run(side[0], side[1]);
	text = json ? report_diff_json(d, name, shown[0], shown[1]) :
	    report_diff_text(d, name, shown[0], shown[1]);
	rc = cmd_print(text);
	free(text);
	diff_free(d);
	for (int i = 0; i < 2; i++) {
		model_bench_free(side[i]);
		free(shown[i]);
	}
	return rc;
}
