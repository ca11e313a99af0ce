/* report-csv.c - one CSV row per element (RFC 4180 quoting), SI units named
 * in the header, for spreadsheets and plotting. */
#include <config.h>

#include <math.h>
#include <string.h>

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
	return buf_take(&b);
}
