/* report-print-entry.c - the one symbol of the print module
 * (beamledger-print.so): its stamp and the PDF and SVG writers of
 * report-pdf.c.  Built with REPORT_PRINT_STALE for tests/print-module.sh,
 * it is a module as another build would make it, which must be refused. */
#include <config.h>

#include "report-print.h"

/* The program reads this one symbol, by name (REPORT_PRINT_SYMBOL). */
extern struct report_print beamledger_print;
struct report_print beamledger_print;

/* Filled when the module is loaded, before the program can look: a static
 * initialiser could not call report_print_stamp_fill. */
__attribute__((constructor)) static void
entry_init(void)
{
	report_print_stamp_fill(&beamledger_print.stamp);
#ifdef REPORT_PRINT_STALE
	/* a build in which the review had one more field */
	beamledger_print.stamp.sizes[0] += sizeof(void *);
#endif
	beamledger_print.pdf = review_pdf;
	beamledger_print.svg = review_svg;
}
