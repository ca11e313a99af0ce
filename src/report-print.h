/* report-print.h - the print module: the PDF and SVG writers (report-pdf*.c,
 * cairo and pango) built as beamledger-print.so and loaded with dlopen
 * only when a PDF or SVG is written, so that no other command loads cairo,
 * pango and glib.  The module calls back into the program for everything
 * else (the program is linked with --export-dynamic), so both must come
 * from the same build: the module carries a stamp that the program checks
 * before it calls anything. */
#ifndef REPORT_PRINT_H
#define REPORT_PRINT_H

#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "core-diff.h"
#include "core-model.h"
#include "core-point.h"
#include "core-report.h"
#include "core-trace.h"
#include "report-review.h"
#include "util-buf.h"

#define REPORT_PRINT_FILE   "beamledger-print.so"
#define REPORT_PRINT_SYMBOL "beamledger_print"
/* Set to a module's path, only that file is tried (tests, and a module
 * kept elsewhere); unset or empty, the usual places. */
#define REPORT_PRINT_ENV    "BEAMLEDGER_PRINT_MODULE"
#define REPORT_PRINT_MAGIC  0x424c5052u         /* "BLPR" */
/* Raised by hand when a call's arguments or what the module reads of the
 * program change in a way the sizes below would not show. */
#define REPORT_PRINT_ABI    1

/* What makes a module fit this program: its version and the layout of
 * every struct the two hand each other.  Plain integers and text, so
 * that a module of any build can be read this far. */
enum { REPORT_PRINT_NSIZES = 16 };
struct report_print_stamp {
	uint32_t magic;                 /* REPORT_PRINT_MAGIC */
	uint32_t abi;                   /* REPORT_PRINT_ABI */
	char     version[32];           /* PACKAGE_VERSION */
	uint32_t sizes[REPORT_PRINT_NSIZES];
};

/* The one symbol the module exports; the stamp first, so that it is read
 * before anything of a layout that may differ. */
struct report_print {
	struct report_print_stamp stamp;
	unsigned char *(*pdf)(const struct review *, size_t *len, char **cause);
	unsigned char *(*svg)(const struct review *, size_t *len, char **cause);
};

/* The stamp of this build; the program and the module both call it. */
static inline void
report_print_stamp_fill(struct report_print_stamp *s)
{
	static const uint32_t sizes[REPORT_PRINT_NSIZES] = {
		sizeof(struct review), sizeof(struct bench), sizeof(struct element),
		sizeof(struct source), sizeof(struct trace), sizeof(struct trace_row),
		sizeof(struct trace_warning), sizeof(struct diff), sizeof(struct diff_change),
		sizeof(struct point), sizeof(struct point_survey), sizeof(struct point_worst),
		sizeof(struct rep_profile), sizeof(struct rep_schematic),
		sizeof(struct model_key_def), sizeof(struct buf),
	};

	memset(s, 0, sizeof *s);
	s->magic = REPORT_PRINT_MAGIC;
	s->abi = REPORT_PRINT_ABI;
	strncpy(s->version, PACKAGE_VERSION, sizeof s->version - 1);
	memcpy(s->sizes, sizes, sizeof sizes);
}

/* The module, found and checked (first use) or as loaded before; never
 * unloaded (pango and fontconfig keep process-long state).  NULL with
 * *cause saying what was looked for and why none would do. */
const struct report_print *report_print_load(char **cause);   /* borrowed */

#endif
