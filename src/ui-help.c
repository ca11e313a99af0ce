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

#define HELP_W 78                   /* columns: fits the smallest workbench */

/* One screen's keys, by task: a heading per task, its keys under it. */
static void
section(struct buf *b, const struct app *a, const char *title, const struct ui_key *keys)
{
	buf_printf(b, "\n%s:\n", title);
	for (int g = 0; g < UG_COUNT; g++) {
		int any = 0;

		for (const struct ui_key *k = keys; k->fn != NULL; k++) {
			size_t from;

			if (k->help == NULL || (int)k->group != g)
				continue;   /* a companion key told with its pair */
			if (!any)
				buf_printf(b, "  %s\n", ui_group_names[g]);
			any = 1;
			from = b->len;
			buf_printf(b, "    %s", ui_key_label(a, k->label));
			buf_pad(b, 14, from);
			{
				/* wrapped under itself, so that no line is cut at 80 columns */
				size_t st[8], ln[8], nl = layout_wrap(k->help, HELP_W - 14, st, ln, 8);

				for (size_t i = 0; i < nl && i < 8; i++)
					buf_printf(b, "%*s%.*s\n", i ? 14 : 0, "", (int)ln[i], k->help + st[i]);
			}
		}
	}
}

static char *
help_text(const struct app *a)
{
	struct buf b;

	buf_init(&b);
	buf_add(&b,
	    "The workbench traces the bench after every change: what power, beam size,\n"
	    "irradiance and fluence each optic sees, and how close it is to its damage\n"
	    "limit (ratio, bar and status: ok, caution, OVER, unrated; n/a for a space).\n"
	    "Caution starts at 1/safety factor of a limit.  The margin line always shows\n"
	    "the worst element and its headroom (how many times the power could rise\n"
	    "before it is over), the safe source power (every rated element at\n"
	    "1/safety factor of its limit) and how many hazards there are; ! lists them.\n"
	    "A row with a hazard is marked with a triangle and written in bold.\n"
	    "\n"
	    "Every change is saved to the bench's draft at once; quitting is always\n"
	    "safe.  r records the draft as a numbered setup (#1, #2, ...) with a note;\n"
	    "h opens the logbook of setups.\n"
	    "Values take units: \"250 mm\", \"1.064 um\", \"5 kW/cm\", \"10 J/cm^2\", \"8 ns\".\n"
	    "A value that does not fit is refused at its field, with the reason, and\n"
	    "nothing is stored.  An empty value unsets an optional key.  - undoes the\n"
	    "last change from the chain; among the values - starts a negative number,\n"
	    "so Esc first.\n"
	    "With operating points, O shows one at a time on the chain, the base first;\n"
	    "a value typed is then that point's override.  W: each element's worst.\n");
	section(&b, a, "Bench list", ui_list_ops.keys);
	section(&b, a, "Workbench: the chain", ui_bench_chain_keys);
	section(&b, a, "Workbench: shifting an element (after s)", ui_bench_move_keys);
	section(&b, a, "Workbench: the values (after Enter or b)", ui_bench_field_keys);
	buf_add(&b,
	    "\nTyping a value (in its box):\n"
	    "    Enter       apply (refused values stay, with the reason under the field)\n"
	    "    Esc         cancel, nothing changes\n"
	    "    Up/Down     apply, then the value above or below\n"
	    "    Left/Right  move the cursor; Home/End (also ^A, ^E) the ends\n"
	    "    Backspace   delete before the cursor; Del (^D) under it\n"
	    "    ^U ^K ^W    clear before the cursor, after it, the word before it\n");
	section(&b, a, "Hazards (!)", ui_hazards_ops.keys);
	section(&b, a, "Reflections (f)", ui_reflections_ops.keys);
	buf_add(&b,
	    "  Every glass surface reflects a little of the beam: a ghost goes back up\n"
	    "  the chain (and after a second reflection forward again) and adds to the\n"
	    "  rating of every optic it meets; a tilted surface throws a stray off the\n"
	    "  axis, to be blocked.  An element's results say which ghosts meet it and\n"
	    "  which it makes.\n");
	section(&b, a, "Tolerances (t)", ui_tolerance_ops.keys);
	buf_add(&b,
	    "  A value may carry a tolerance after it: \"250 mm +- 2 mm\" (normal, that\n"
	    "  standard deviation), \"200 mJ +- 5 %\", \"0.99 +- 0.004 uniform\" (anywhere\n"
	    "  within); a value typed without one keeps it, \"+- 0\" removes it.  t draws\n"
	    "  every tolerance at random a few thousand times and traces each draw: the\n"
	    "  chance that each rated optic is over or at caution (+- one standard\n"
	    "  error; \"<0.15 %\": no sample was), the histogram of the selected one's\n"
	    "  ratio, and its drivers: r, the correlation of a tolerance's draw with the\n"
	    "  ratio (near +1 or -1: that tolerance alone moves it).  These are\n"
	    "  statistical estimates; beamledger tolerance runs as many samples as asked.\n"
	    "  A run that takes over a second shows how far it is; Esc or Ctrl-C stops\n"
	    "  it, and the screen shows the samples done so far, marked STOPPED.\n");
	section(&b, a, "Beam profile (z)", ui_profile_ops.keys);
	buf_add(&b,
	    "  The plot shows both 1/e^2 radii (x and y) along the path from the source\n"
	    "  to the end of the selected element's branch, the power below them, every\n"
	    "  element marked on the axis with its id, and the foci; f lays a ghost over\n"
	    "  it (its radius at each element it meets), the worst first.\n");
	section(&b, a, "Logbook (h)", ui_history_ops.keys);
	section(&b, a, "Parts shelf (S)", ui_parts_ops.keys);
	section(&b, a, "Operating points side by side (o)", ui_points_ops.keys);
	section(&b, a, "Sweep (v)", ui_sweep_ops.keys);
	section(&b, a, "Help and compare screens", ui_text_keys);
	section(&b, a, "Everywhere", ui_global_keys);
	buf_add(&b,
	    "  The mouse selects rows where the terminal offers it (double click: open,\n"
	    "  edit or compare; the wheel scrolls).  NO_COLOR turns colour off; status\n"
	    "  is always written out in words.\n\n");
	buf_add(&b, report_safety_text);
	return buf_take(&b);
}

void
ui_help_push(struct app *a)
{
	if (a->top != NULL && a->top->ops == &ui_text_ops)
		return;
	ui_text_view(a, "help", help_text(a));
}
