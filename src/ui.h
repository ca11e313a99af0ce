/* ui.h - the terminal workbench from outside: run it (cmd-ui.c), or drive
 * it key by key (benches/bench_ui.c).  No curses types here.  Owned by the
 * workbench. */
#ifndef UI_H
#define UI_H

#include <stdio.h>

struct app;

struct ui_opts {
	const char *db_path;        /* NULL: store_default_path() */
	const char *bench;          /* open this bench straight away; NULL: the list */
	const char *author;         /* for commits; NULL: "unknown" */
	FILE       *out, *in;       /* NULL: the terminal (initscr) */
	const char *term;           /* with out/in: the terminal type */
	int         ascii;          /* -1: from the locale's codeset */
	int         color;          /* -1: NO_COLOR and has_colors() decide */
};

/* The whole program: opens the database and the terminal, runs until the
 * user quits, restores the terminal.  Returns the exit status (0, or 2
 * after printing why it could not start). */
int  ui_run(const struct ui_opts *);

/* Pieces of ui_run, for benchmarks and replays. */
struct app *ui_app_new(const struct ui_opts *, char **cause);   /* caller frees */
void        ui_app_frame(struct app *);        /* paints the screen once */
int         ui_app_key(struct app *, int key); /* one key (code point or UI_FKEY); 1: quit */
void        ui_app_free(struct app *);         /* restores the terminal; NULL ok */

#endif
