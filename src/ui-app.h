/* ui-app.h - the workbench's insides, shared by the ui-*.c files: the app
 * (one per process: the store, the open bench, its trace and undo history,
 * the pane stack), panes as tables of functions, key tables, colours and
 * glyphs.  Only ui-* files include this (and <curses.h>).
 *
 * Rules: a pane's key handler changes state and returns what must happen
 * next (enum ui_reaction); only ui_app_frame() paints.  Every change to the
 * bench goes through app_edit(), which snapshots for undo, retraces and
 * saves the draft.  The screens draw `shown` (the draft, or a copy at the
 * operating point on screen) and edit `bench` (the draft); with a point on
 * screen app_edit refuses layout changes, and values go to the point's
 * overrides (ui_point_override).  Owned by the workbench. */
#ifndef UI_APP_H
#define UI_APP_H

#include <curses.h>
#include <stdio.h>

#include "core-layout.h"
#include "core-model.h"
#include "core-point.h"
#include "core-trace.h"
#include "store.h"
#include "ui.h"

#define UI_MIN_W 80
#define UI_MIN_H 24

/* Keys: characters are their code points; curses function keys are
 * offset so the two never meet (KEY_DOWN is 258, so is 'Ă'). */
#define UI_FKEY(k)     ((k) | 0x1000000)
#define UI_IS_FKEY(k)  (((k) & 0x1000000) != 0)
#define UI_CTRL(c)     ((c) & 0x1f)
#define UI_ESC         27

enum ui_reaction {
	UI_NONE    = 0,
	UI_REDRAW  = 1 << 0,
	UI_POP     = 1 << 1,        /* close this pane */
	UI_QUIT    = 1 << 2
};

enum ui_color {
	UC_NORMAL, UC_TITLE, UC_HEADER, UC_SELECT, UC_OK, UC_CAUTION, UC_OVER,
	UC_UNRATED, UC_DIM, UC_KEY, UC_ERROR, UC_INFO, UC_STATUS, UC_WX, UC_WY,
	UC_POWER, UC_FOCUS, UC_FRAME, UC_INPUT, UC_HAZARD, UC_COUNT
};

/* Glyphs with an ASCII twin. */
enum ui_glyph {
	GL_BRANCH, GL_VBAR, GL_HBAR, GL_UPDOWN, GL_LEFTRIGHT, GL_ARROW, GL_DOT,
	GL_WX, GL_WY, GL_WXY, GL_POWER, GL_FOCUS, GL_MARK, GL_ELLIPSIS, GL_TIMES,
	GL_HAZARD, GL_PIN, GL_BAND, GL_AXIS, GL_KEY, GL_GROUP, GL_HEAD, GL_COUNT
};

struct app;
struct ui_pane;

typedef enum ui_reaction (*ui_action)(struct app *, struct ui_pane *);

enum {
	UI_K_EDITS  = 1 << 0,       /* changes the database: refused when view-only */
	UI_K_LAYOUT = 1 << 1        /* changes the base's layout: refused while a point is shown */
};

/* The tasks keys are grouped by, on the key line and in the help. */
enum ui_group { UG_MOVE, UG_BENCHES, UG_LAYOUT, UG_VALUES, UG_RECORD, UG_LOOK, UG_LEAVE,
	UG_COUNT };
extern const char *const ui_group_names[UG_COUNT];

struct ui_key {
	int         codes[4];       /* 0 ends the list */
	const char *label;          /* as shown: "p", "Enter", "Del" */
	const char *hint;           /* word on the key line; NULL: help screen only */
	int         prio;           /* hint priority: 0 always shown */
	const char *help;           /* line on the help screen */
	ui_action   fn;
	unsigned    flags;
	enum ui_group group;
};
#define UI_KEYS_END { { 0 }, NULL, NULL, 0, NULL, NULL, 0, UG_MOVE }

struct ui_pane_ops {
	const char          *name;          /* help-screen section */
	int                  modal;         /* drawn over the pane below */
	const struct ui_key *keys;          /* ends with a NULL fn */
	void               (*draw)(struct app *, struct ui_pane *, int h, int w);
	/* Keys the table does not take (typing); may be NULL. */
	enum ui_reaction   (*key)(struct app *, struct ui_pane *, int key);
	/* A click on screen row y, column x (button 1; dbl: double click). */
	enum ui_reaction   (*click)(struct app *, struct ui_pane *, int y, int x, int dbl);
	/* The pane is on top again (after the one above it closed). */
	void               (*enter)(struct app *, struct ui_pane *);
	/* Hints for the current state, replacing the table's; may be NULL. */
	size_t             (*hints)(struct app *, struct ui_pane *, struct layout_hint *, size_t max);
	void               (*release)(struct ui_pane *);
};

struct ui_pane {
	const struct ui_pane_ops *ops;
	void                     *data;     /* owned; ops->release frees it */
	struct ui_pane           *below;
};

/* A one-line text editor (UTF-8, cursor by byte). */
struct ui_line {
	char   *s;                  /* owned */
	size_t  len, cap, cur;
	int     fresh;              /* text as set, untouched: typing replaces it */
};

struct app {
	struct store      *store;       /* owned */
	int                readonly;
	char              *author;      /* owned */
	int                ascii, color, mouse;
	SCREEN            *screen;      /* borrowed from curses */
	struct ui_pane    *top;         /* pane stack, owned */
	int                quit;
	int                too_small;
	char              *msg;         /* owned: last message */
	int                msg_error;
	unsigned           key_seq;     /* keys handled so far */
	unsigned           msg_seq;     /* key_seq when msg was set */

	/* the open bench (bench == NULL: none) */
	char              *name;        /* owned */
	struct bench      *bench;       /* owned: the draft in memory */
	struct trace      *trace;       /* owned */
	/* the trace holds the main beam only: its reflections are counted
	 * when no key is waiting (ui_app_idle) or before the next key */
	int                ghosts_pending;
	struct layout_row *rows;        /* owned: the chain */
	size_t             nrows;
	int                sel, scroll; /* selected row, first shown */
	struct bench     **undo, **redo;/* owned snapshots, newest last */
	size_t             nundo, nredo;
	int                latest_rev;  /* 0: none */
	int                draft_changed;
	char              *unsaved;     /* owned: why the last save failed, NULL when saved */
	char              *stored;      /* owned: bench-file text of the draft as last
	                                 * loaded or saved here, to notice another
	                                 * writer's change before overwriting it */
	int                cursor_y, cursor_x;  /* where the terminal cursor goes, -1: hidden */
	/* what the draft is: setup base_rev as recorded (base_text its
	 * bench-file text), or changed since it; 0: nothing recorded */
	int                base_rev;
	char              *base_text;   /* owned */
	long long          saved_at;    /* time of the last save here; 0: none yet */
	char              *demo_name;   /* owned: the demo bench's name */
	int                demo_told;   /* "invented data" said once */
	int                pane_seq;    /* bumped when the top pane changes */
	/* the operating point on screen: -1 the base, else an index into
	 * bench->points; `shown` is the bench traced and drawn (the draft
	 * itself, or a copy with the point applied, owned then) */
	long               point;
	struct bench      *shown;
	int                shown_owned;
	int                point_edit;  /* app_edit may change the draft under a point */
	/* the chain shows each element's worst over the base and every point */
	int                worst_all;
	struct point_survey survey;     /* owned when have_survey */
	int                have_survey;
};

/* ---- ui-app.c: life cycle, frame, edits ---- */
/* Work left from the last retrace (the reflections): does it and returns
 * 1 (the screen needs a frame), or 0 when there is none. */
int   ui_app_idle(struct app *);
void  app_push(struct app *, const struct ui_pane_ops *, void *data);
void  app_pop(struct app *);
void  app_msg(struct app *, int error, const char *fmt, ...)
          __attribute__((format(printf, 3, 4)));
void  app_msg_take(struct app *, int error, char *cause);   /* takes cause */
/* Opens bench `name` (its draft) as the current bench. */
int   app_open_bench(struct app *, const char *name, char **cause);
void  app_close_bench(struct app *);
/* Runs fn on the draft: snapshot for undo, retrace, save.  -1 with *cause
 * (the bench untouched) when fn or the view-only mode refuses. */
typedef int (*app_edit_fn)(struct bench *, void *arg, char **cause);
int   app_edit(struct app *, app_edit_fn, void *arg, char **cause);
/* The point on screen by name; NULL: the base. */
const char *app_point_name(const struct app *);
int   app_undo(struct app *);
int   app_redo(struct app *);
/* Replaces the draft with a bench just loaded (restore); undo brings the
 * old one back.  Takes b. */
void  app_replace_bench(struct app *, struct bench *b);
void  app_retrace(struct app *);
int   app_save(struct app *);
void  app_refresh_rev(struct app *);
/* The draft in words: "draft = #3", "draft: changed since #3, not
 * recorded", "draft, nothing recorded yet". */
void  app_draft_words(const struct app *, char *buf, size_t n);
/* After a record or a reinstate: the draft is setup no now. */
void  app_set_base(struct app *, int no);
/* "#3": a setup as the screens write it; and as the store takes it. */
void  app_setup_name(int no, char *buf, size_t n);
void  app_setup_ref(int no, char *buf, size_t n);
/* The frame every main screen shares: the header (beam first) on row 0
 * with `where` after the bench and `more` (may be NULL; left out first
 * when the line is full), the standing caution on row 1, the message at
 * h-3, the margin line at h-2 and the key line at h-1. */
void  ui_frame(struct app *, const char *where, const char *more, int h, int w);
void  ui_frame_bottom(struct app *, const struct layout_hint *, size_t nh, int h, int w);
/* The selected row, NULL when the chain is empty. */
const struct layout_row *app_sel_row(const struct app *);
const struct trace_row  *app_sel_trace(const struct app *);
void  app_select_id(struct app *, const char *id, int port);
int   app_refuse_readonly(struct app *);
/* UI_QUIT, or a question first when the draft could not be saved. */
enum ui_reaction app_quit(struct app *);

/* ---- ui-draw.c: terminal, colours, glyphs, drawing helpers ---- */
int         ui_term_open(struct app *, const struct ui_opts *, char **cause);
void        ui_term_close(void);
void        ui_term_restore(void);              /* safe from signal and OOM paths */
int         ui_stop_requested(void);            /* SIGINT, SIGTERM or SIGHUP came */
void        ui_colors_init(struct app *);
attr_t      ui_attr(const struct app *, enum ui_color);
attr_t      ui_status_attr(const struct app *, enum damage_status);
const char *ui_glyph(const struct app *, enum ui_glyph);
/* A key label as this terminal can show it ("Up/Dn" for the arrows in ASCII). */
const char *ui_key_label(const struct app *, const char *label);
/* Text at (y, x) fitted to exactly w columns. */
void        ui_put(struct app *, int y, int x, int w, const char *s, enum ui_color);
void        ui_put_attr(struct app *, int y, int x, int w, const char *s, attr_t);
void        ui_put_right(struct app *, int y, int x, int w, const char *s, attr_t);
void        ui_fill(struct app *, int y, int x, int w, attr_t);
void        ui_hints(struct app *, int y, int w, const struct layout_hint *, size_t n);
/* Key hints from a table (entries with a hint word). */
size_t      ui_table_hints(const struct ui_key *, struct layout_hint *, size_t max);
/* A pane's key line (its hints and "? help") at row y. */
void        ui_key_line(struct app *, const struct ui_key *, int y, int w);
/* The message at row h-2 and the key line at h-1. */
void        ui_footer(struct app *, const struct ui_key *, int h, int w);
void        ui_box(struct app *, int y, int x, int h, int w, const char *title);
int         ui_read_key(struct app *, int timeout_ms);   /* -1: none */
int         ui_key_match(const struct ui_key *, int key);

/* ---- ui-line.c: the line editor and dialogs ---- */
void  ui_line_set(struct ui_line *, const char *s);
void  ui_line_release(struct ui_line *);
/* 1: the key was an editing key and was used. */
int   ui_line_key(struct ui_line *, int key);
/* Draws the line in w columns at (y, x), scrolled so the cursor shows;
 * puts the terminal cursor there. */
void  ui_line_draw(struct app *, struct ui_line *, int y, int x, int w);

typedef int (*ui_prompt_fn)(struct app *, void *arg, const char *text, char **cause);
/* A prompt dialog: title, a line of explanation, initial text.  On Enter
 * fn runs; a failure keeps the dialog open with the cause under the field.
 * arg_free (may be NULL) releases arg when the dialog closes. */
void  ui_prompt(struct app *, const char *title, const char *help, const char *init,
          ui_prompt_fn fn, void *arg, void (*arg_free)(void *));
typedef void (*ui_confirm_fn)(struct app *, void *arg, int yes);
void  ui_confirm(struct app *, const char *question, ui_confirm_fn fn, void *arg);
typedef void (*ui_menu_fn)(struct app *, void *arg, int choice);
/* items[i] "key\tlabel\thelp"; -1 on cancel is not called. */
void  ui_menu(struct app *, const char *title, const char *const *items, size_t n,
          ui_menu_fn fn, void *arg);
/* A scrollable text screen (help, diff); takes text. */
void  ui_text_view(struct app *, const char *title, char *text);

/* ---- the screens ---- */
void  ui_list_push(struct app *);               /* ui-list.c */
void  ui_bench_push(struct app *);              /* ui-bench.c */
void  ui_profile_push(struct app *);            /* ui-profile.c */
void  ui_history_push(struct app *);            /* ui-history.c */
void  ui_hazards_push(struct app *);            /* ui-hazards.c */
void  ui_reflections_push(struct app *);        /* ui-reflections.c: every ghost and stray */
void  ui_tolerance_push(struct app *);          /* ui-tolerance.c: the odds of over */
/* Compares the draft with the setup it came from, as a text screen. */
void  ui_compare_draft(struct app *);           /* ui-history.c */
void  ui_parts_push(struct app *);              /* ui-parts.c */
void  ui_help_push(struct app *);               /* ui-help.c */
void  ui_record_prompt(struct app *);           /* ui-history.c */
void  ui_points_push(struct app *);             /* ui-points.c: every point side by side */
/* A full screen's title line: the program, the bench, what it shows. */
void  ui_screen_title(struct app *, int w, const char *what);
/* ui-sweep.c: KNOB FROM .. TO, then the sweep; knob: the marked field
 * ("L1.focal", "source.power"), NULL: the selected element's usual knob */
void  ui_sweep_prompt(struct app *, const char *knob);
/* ui-points.c: the next operating point on the chain (base first); the
 * chain's worst over every point on or off; a value typed while a point is
 * shown, stored as that point's override (id NULL: a source key). */
void  ui_point_cycle(struct app *);
void  ui_point_worst_toggle(struct app *);
int   ui_point_override(struct app *, const char *id, const char *key, const char *text,
          char **cause);
/* The survey behind the worst-of-all-points chain, NULL when off. */
const struct point_survey *app_survey(struct app *);
/* Every pane's ops, for the help screen. */
extern const struct ui_pane_ops ui_list_ops, ui_bench_ops, ui_profile_ops,
    ui_history_ops, ui_parts_ops, ui_text_ops, ui_hazards_ops, ui_points_ops, ui_sweep_ops,
    ui_reflections_ops;
extern const struct ui_pane_ops ui_tolerance_ops;
/* Keys every pane takes (help, quit, redraw). */
extern const struct ui_key ui_global_keys[];

#endif
