/* ui-bench.h - what the workbench screen (ui-bench.c) and its value editor
 * (ui-fields.c) share.  Private to those two and to the screens that
 * place elements on the chain (ui-parts.c).  Owned by the workbench. */
#ifndef UI_BENCH_H
#define UI_BENCH_H

#include "ui-app.h"

enum wb_focus { WB_CHAIN, WB_FIELDS };
enum wb_mode { WB_ELEMENT, WB_SETTINGS };  /* what the fields show */

struct wb_geom {
	int chain_y, chain_h;       /* rows of the chain table */
	int sep_y;                  /* the line above the details */
	int detail_y, detail_h;
};

struct wb {
	enum wb_focus  focus;
	enum wb_mode   mode;
	int            field, field_top;    /* selected field, first shown */
	int            editing;             /* the line editor is open on `field` */
	struct ui_line line;
	char          *error;               /* owned: why the last value was refused */
	char          *moving;              /* owned: id being shifted, NULL */
	char          *field_of;            /* owned: element whose field `field` is, NULL */
	struct { int before; } add;         /* the add menu's argument */
};

void   wb_geometry(int h, size_t nrows, struct wb_geom *);
void   wb_draw_detail(struct app *, struct wb *, const struct wb_geom *, int w);
void   wb_draw_results(struct app *, int y, int x, int h, int w);
void   wb_draw_status(struct app *, int y, int w);
/* The whole workbench pane (the pane table's draw). */
void   wb_draw(struct app *, struct ui_pane *, int h, int w);
size_t wb_hints(struct app *, struct wb *, struct layout_hint *, size_t max);
/* The marked field as a sweep knob ("L1.focal", "source.power"), when it
 * is a number of the selected element or of the source (caller frees);
 * NULL otherwise. */
char  *wb_marked_knob(struct app *, struct wb *);
/* Adds el (taken) after the selection, as `a` does. */
int    wb_place(struct app *, struct element *el, char **cause);

/* ui-place.c */
enum ui_reaction wb_k_place(struct app *, struct ui_pane *);
enum ui_reaction wb_k_place_before(struct app *, struct ui_pane *);
enum ui_reaction wb_k_duplicate(struct app *, struct ui_pane *);

/* ui-fields.c */
enum ui_reaction wb_k_fields(struct app *, struct ui_pane *);
enum ui_reaction wb_k_settings(struct app *, struct ui_pane *);
enum ui_reaction wb_edit_key(struct app *, struct wb *, int key);
enum ui_reaction wb_fields_type(struct app *, struct wb *, int key);   /* typing at a field edits it */
enum ui_reaction wb_click_fields(struct app *, struct wb *, int row, int dbl, struct ui_pane *);
extern const struct ui_key ui_bench_field_keys[];
extern const struct ui_key ui_bench_chain_keys[];
extern const struct ui_key ui_bench_move_keys[];

#endif
