/* report-csv.c - one CSV row per element (RFC 4180 quoting), SI units named
 * in the header, for spreadsheets and plotting. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "core-ghost.h"
#include "report.h"
#include "util-buf.h"

static void
field(struct buf *b, const char *s)
{
	if (strpbrk(s, ",\"\r\n") == NULL) {
		buf_add(b, s);
		return;
	}
	buf_addc(b, '"');
	for (; *s != '\0'; s++) {
		if (*s == '"')
			buf_addc(b, '"');
		buf_addc(b, *s);
	}
	buf_addc(b, '"');
}

static void
number(struct buf *b, double v)
{
	buf_addc(b, ',');
	if (isfinite(v))
		buf_printf(b, "%.10g", v);
}

/* The reflections in the same columns, to filter on type: a "ghost" row
 * per element a ghost meets (branch: its surfaces, depth: its order), a
 * "stray" row per stray (power_in: its power). */
static void
ghost_rows(struct buf *b, const struct trace *t)
{
	const struct ghost_set *gs = t->ghosts;
	char name[2][160], what[330];

	for (size_t i = 0; i < gs->n; i++) {
		const struct ghost *g = &gs->g[i];

		ghost_surface_name(g, 0, name[0], sizeof name[0]);
		if (g->order == 2)
			ghost_surface_name(g, 1, name[1], sizeof name[1]);
		snprintf(what, sizeof what, "%s%s%s", name[0], g->order == 2 ? ">" : "",
		    g->order == 2 ? name[1] : "");
		for (size_t k = 0; gs->rows_kept && k < g->nrows; k++) {
			const struct ghost_row *r = &gs->rows[g->row0 + k];
			char fl[128] = "";

			field(b, r->el->id);
			buf_add(b, ",ghost,");
			field(b, what);
			buf_printf(b, ",%d", g->order);
			number(b, t->rows[r->trace_row].z);
			number(b, r->power_in);
			number(b, r->power_lost);
			number(b, r->wx);
			number(b, r->wy);
			number(b, r->irradiance);
			number(b, r->linear_density);
			number(b, r->peak_irradiance);
			number(b, r->fluence);
			buf_add(b, ",,,,");
			number(b, r->ratio);
			buf_printf(b, ",%s,", damage_status_name(r->status));
			for (int f = 0; f < GF_COUNT; f++)
				if (g->flags & (1u << f))
					snprintf(fl + strlen(fl), sizeof fl - strlen(fl), "%s%s",
					    fl[0] ? ";" : "", ghost_flag_name(1u << f));
			field(b, fl);
			buf_add(b, "\r\n");
		}
	}
	for (size_t i = 0; i < gs->nstrays; i++) {
		const struct ghost_stray *s = &gs->strays[i];

		snprintf(what, sizeof what, "%s.%s", s->from->id, s->what);
		field(b, s->from->id);
		buf_add(b, ",stray,");
		field(b, what);
		buf_add(b, ",1,");
		number(b, s->power);
		buf_add(b, ",,,,,,,");
		number(b, s->peak_power);
		buf_add(b, ",,,,,");
		buf_add(b, s->power >= t->bench->stray_warn ? "block," : ",");
		buf_add(b, "\r\n");
	}
}

char *
report_csv(const struct trace *t)
{
	struct buf b;
	char br[160], flags[256];

	buf_init(&b);
	buf_add(&b, "id,type,branch,depth,z_m,power_in_W,power_lost_W,radius_x_m,radius_y_m,"
	    "irradiance_W_m2,linear_density_W_m,peak_irradiance_W_m2,fluence_J_m2,"
	    "peak_power_W,field_V_m,clip_loss,b_integral_rad,ratio,status,flags\r\n");
	for (size_t i = 0; i < t->nrows; i++) {
		const struct trace_row *r = &t->rows[i];

		field(&b, r->el->id);
		buf_printf(&b, ",%s,", model_type_name(r->el->type));
		trace_branch_name(r->parent, r->port, br, sizeof br);
		field(&b, br);
		buf_printf(&b, ",%u", r->depth);
		number(&b, r->z);
		number(&b, r->power_in);
		number(&b, r->power_lost);
		number(&b, r->wx);
		number(&b, r->wy);
		number(&b, r->irradiance);
		number(&b, r->linear_density);
		number(&b, r->peak_irradiance);
		number(&b, r->fluence);
		number(&b, r->peak_power);
		number(&b, r->field);
		number(&b, r->clip_loss);
		number(&b, r->b_integral);
		number(&b, r->ratio);
		buf_printf(&b, ",%s,", damage_status_name(r->status));
		report_flags(r->flags, flags, sizeof flags, ";");
		field(&b, flags);
		buf_add(&b, "\r\n");
	}
	if (t->ghosts != NULL)
		ghost_rows(&b, t);
	return buf_take(&b);
}
