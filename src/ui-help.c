/* ui-help.c - the help screen, written from the key tables themselves so
 * that it lists every key there is, followed by the laser-safety cautions.
 * Owned by the workbench. */
#include <config.h>

#include <stdlib.h>
#include <string.h>

#include "report.h"
#include "ui-bench.h"
#include "util-buf.h"
#include "util-err.h"

extern const struct ui_key ui_text_keys[];

static void
section(struct buf *b, const struct app *a, const char *title, const struct ui_key *k)
{
	buf_printf(b, "\n%s:\n", title);
	for (; k->fn != NULL; k++) {
		size_t from = b->len;

		if (k->help == NULL)        /* a companion key told with its pair (↑↓) */
			continue;
		buf_printf(b, "  %s", ui_key_label(a, k->label));
		buf_pad(b, 12, from);
		buf_printf(b, "%s\n", k->help);
	}
}

static char *
help_text(const struct app *a)
{
	struct buf b;

	buf_init(&b);
	buf_add(&b,
	    "The workbench traces the bench after every change: what power, beam size,\n"
	    "peak irradiance and fluence each optic sees, and how close it is to its\n"
	    "damage threshold (ratio, bar and status: ok, caution, OVER, unrated).\n"
	    "Caution starts at 1/safety-factor of a threshold.  The status line always\n"
	    "shows the worst element, the safe source power (every rated element at\n"
	    "1/safety factor of its threshold) and any beam that leaves the bench.\n"
	    "\n"
	    "Every change is saved to the bench's draft at once; quitting is always\n"
	    "safe.  c commits the draft as a revision with a note; h shows the history.\n"
	    "Values take units: \"250 mm\", \"1.064 um\", \"5 kW/cm\", \"10 J/cm^2\", \"8 ns\".\n"
	    "A value that does not fit is refused at its field, with the reason, and\n"
	    "nothing is stored.  An empty value unsets an optional key.\n");
	section(&b, a, "Bench list", ui_list_ops.keys);
	section(&b, a, "Workbench: the chain", ui_bench_chain_keys);
	section(&b, a, "Workbench: moving an element (after m)", ui_bench_move_keys);
	section(&b, a, "Workbench: the values (after Enter or s)", ui_bench_field_keys);
	buf_add(&b,
	    "\nTyping a value:\n"
	    "  Enter       apply (refused values stay, with the reason under the field)\n"
	    "  Esc         cancel, nothing changes\n"
	    "  Left/Right  move the cursor; Home/End (also ^A, ^E) the ends\n"
	    "  Backspace   delete before the cursor; Del (^D) under it\n"
	    "  ^U ^K ^W    clear before the cursor, after it, the word before it\n");
	section(&b, a, "Beam profile (p)", ui_profile_ops.keys);
	buf_add(&b,
	    "  The plot shows both 1/e^2 radii (x and y) along the path from the source\n"
	    "  to the end of the selected element's branch, the power below them, every\n"
	    "  element marked on the axis with its id, and the foci.\n");
	section(&b, a, "History (h)", ui_history_ops.keys);
	section(&b, a, "Parts shelf (P)", ui_parts_ops.keys);
	section(&b, a, "Operating points side by side (o)", ui_points_ops.keys);
	section(&b, a, "Sweep (v)", ui_sweep_ops.keys);
	section(&b, a, "Help and diff screens", ui_text_keys);
	section(&b, a, "Everywhere", ui_global_keys);
	buf_add(&b,
	    "  The mouse selects rows where the terminal offers it (double click: open,\n"
	    "  edit or diff; the wheel scrolls).  NO_COLOR turns colour off; status is\n"
	    "  always written out in words.\n\n");
	buf_add(&b, report_safety_text);
	return buf_take(&b);
}

void
ui_help_push(struct app *a)
{
	if (a->top != NULL && a->top->ops == &ui_text_ops)
		return;
	ui_text_view(a, "help: every key, and the laser-safety cautions", help_text(a));
}
