/* ui-draw.c - the terminal under the workbench: opening and restoring it
 * (on every exit path, signals and out-of-memory included), the colour and
 * glyph tables, and small drawing helpers that put already-formatted text
 * on the screen.  Owned by the workbench. */
#include <config.h>

#include <langinfo.h>
#include <locale.h>
#include <signal.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include <wchar.h>

#include "ui-app.h"
#include "ui-bench.h"
#include "util-err.h"

/* The one piece of process state: whether curses owns the terminal, so
 * that a fatal signal or the out-of-memory hook knows to give it back. */
static volatile sig_atomic_t term_active;
/* A polite request to stop (SIGINT, SIGTERM, SIGHUP): the main loop
 * notices it and leaves the normal way.  The draft is already saved. */
static volatile sig_atomic_t stop_requested;

int
ui_stop_requested(void)
{
	return stop_requested != 0;
}

static void
stop_signal(int sig)
{
	(void)sig;
	stop_requested = 1;
}

/* ---- colours: one table, with what a monochrome terminal gets instead ---- */

static const struct {
	short  fg, bg;
	attr_t with_color;          /* added to the pair */
	attr_t mono;                /* without colour */
} color_table[UC_COUNT] = {
	[UC_NORMAL]  = { -1, -1, 0, 0 },
	[UC_TITLE]   = { COLOR_BLACK, COLOR_CYAN, A_BOLD, A_REVERSE | A_BOLD },
	[UC_HEADER]  = { COLOR_CYAN, -1, A_BOLD, A_UNDERLINE },
	[UC_SELECT]  = { COLOR_BLACK, COLOR_WHITE, 0, A_REVERSE },
	[UC_OK]      = { COLOR_GREEN, -1, 0, 0 },
	[UC_CAUTION] = { COLOR_YELLOW, -1, A_BOLD, A_BOLD },
	[UC_OVER]    = { COLOR_RED, -1, A_BOLD, A_BOLD | A_UNDERLINE },
	[UC_UNRATED] = { -1, -1, A_DIM, A_DIM },
	[UC_DIM]     = { -1, -1, A_DIM, A_DIM },
	[UC_KEY]     = { COLOR_CYAN, -1, A_BOLD, A_BOLD },
	[UC_ERROR]   = { COLOR_WHITE, COLOR_RED, A_BOLD, A_BOLD | A_REVERSE },
	[UC_INFO]    = { COLOR_GREEN, -1, 0, 0 },
	[UC_STATUS]  = { COLOR_WHITE, COLOR_BLUE, 0, A_REVERSE },
	[UC_WX]      = { COLOR_CYAN, -1, A_BOLD, 0 },
	[UC_WY]      = { COLOR_MAGENTA, -1, A_BOLD, 0 },
	[UC_POWER]   = { COLOR_YELLOW, -1, 0, 0 },
	[UC_FOCUS]   = { COLOR_RED, -1, A_BOLD, A_BOLD },
	[UC_FRAME]   = { COLOR_CYAN, -1, 0, 0 },
	[UC_INPUT]   = { COLOR_BLACK, COLOR_YELLOW, 0, A_UNDERLINE | A_BOLD },
	[UC_HAZARD]  = { COLOR_RED, -1, A_BOLD, A_BOLD },
};

void
ui_colors_init(struct app *a)
{
	const char *nc = getenv("NO_COLOR");

	if (a->color < 0)
		a->color = !(nc != NULL && nc[0] != '\0') && has_colors();
	if (a->color && !has_colors())
		a->color = 0;
	if (!a->color)
		return;
	start_color();
	use_default_colors();
	for (int i = 1; i < UC_COUNT; i++)
		init_pair((short)i, color_table[i].fg, color_table[i].bg);
}

attr_t
ui_attr(const struct app *a, enum ui_color c)
{
	if ((unsigned)c >= UC_COUNT)
		return 0;
	if (!a->color)
		return color_table[c].mono;
	return (c == UC_NORMAL ? 0 : COLOR_PAIR(c)) | color_table[c].with_color;
}

attr_t
ui_status_attr(const struct app *a, enum damage_status s)
{
	static const enum ui_color by_status[] = { UC_UNRATED, UC_OK, UC_CAUTION, UC_OVER };

	return ui_attr(a, by_status[(unsigned)s < 4 ? s : 0]);
}

/* ---- glyphs ---- */

static const char *const glyphs[GL_COUNT][2] = {
	[GL_BRANCH]    = { "\u2514 ", "`-" },
	[GL_VBAR]      = { "\u2502", "|" },
	[GL_HBAR]      = { "\u2500", "-" },
	[GL_UPDOWN]    = { "\u2191\u2193", "Up/Dn" },
	[GL_LEFTRIGHT] = { "\u2190\u2192", "Lt/Rt" },
	[GL_ARROW]     = { "\u2192", "->" },
	[GL_DOT]       = { "\u00b7", "." },
	[GL_WX]        = { "x", "x" },
	[GL_WY]        = { "y", "y" },
	[GL_WXY]       = { "\u25cf", "*" },
	[GL_POWER]     = { "\u2580", "=" },
	[GL_FOCUS]     = { "\u25c6", "F" },
	[GL_MARK]      = { "\u2502", "|" },
	[GL_ELLIPSIS]  = { "\u2026", "~" },
	[GL_TIMES]     = { "\u00d7", "x" },
	[GL_HAZARD]    = { "\u25b2", "!" },
	[GL_PIN]       = { "\u21c4", "<>" },
	[GL_BAND]      = { "\u2592", ":" },
	[GL_AXIS]      = { "\u2500", "-" },
	[GL_KEY]       = { LAYOUT_KEY_SIGN, ">" },
	[GL_GROUP]     = { LAYOUT_GROUP_SIGN, ":" },
	[GL_HEAD]      = { "\u25b8", ">" },
};

const char *const ui_group_names[UG_COUNT] = {
	[UG_MOVE] = "Moving around", [UG_BENCHES] = "Benches",
	[UG_LAYOUT] = "Laying out the chain",
	[UG_VALUES] = "Values", [UG_RECORD] = "Record, history, compare",
	[UG_LOOK] = "Looking closer", [UG_LEAVE] = "Leaving",
};

const char *
ui_glyph(const struct app *a, enum ui_glyph g)
{
	return (unsigned)g < GL_COUNT ? glyphs[g][a->ascii ? 1 : 0] : "?";
}

/* ---- drawing helpers ---- */

/* Text fitted to w columns, in ASCII when the terminal needs it. */
static void
put_fitted(struct app *a, int y, int x, int w, const char *s, attr_t at,
    enum layout_align al)
{
	char buf[1024], *asc = NULL;

	if (w <= 0)
		return;
	if (w > 250)
		w = 250;
	if (s == NULL)
		s = "";
	if (a->ascii)
		s = asc = layout_ascii(s);
	layout_fit_text(buf, sizeof buf, s, w, al, a->ascii);
	free(asc);
	attrset(at);
	mvaddstr(y, x, buf);
	attrset(A_NORMAL);
}

void
ui_put_attr(struct app *a, int y, int x, int w, const char *s, attr_t at)
{
	put_fitted(a, y, x, w, s, at, LAYOUT_LEFT);
}

void
ui_put(struct app *a, int y, int x, int w, const char *s, enum ui_color c)
{
	ui_put_attr(a, y, x, w, s, ui_attr(a, c));
}

void
ui_put_right(struct app *a, int y, int x, int w, const char *s, attr_t at)
{
	put_fitted(a, y, x, w, s, at, LAYOUT_RIGHT);
}

void
ui_fill(struct app *a, int y, int x, int w, attr_t at)
{
	(void)a;
	attrset(at);
	for (int i = 0; i < w; i++)
		mvaddch(y, x + i, ' ');
	attrset(A_NORMAL);
}

const char *
ui_key_label(const struct app *a, const char *l)
{
	static const struct { const char *u, *asc; } map[] = {
		{ "\u2191\u2193", "Up/Dn" }, { "\u2190\u2192", "Lt/Rt" },
		{ "\u2191", "Up" }, { "\u2193", "Dn" }, { "\u2192", "Rt" },
	};

	if (!a->ascii)
		return l;
	for (size_t i = 0; i < sizeof map / sizeof *map; i++)
		if (strcmp(l, map[i].u) == 0)
			return map[i].asc;
	return l;
}

size_t
ui_table_hints(const struct ui_key *k, struct layout_hint *h, size_t max)
{
	size_t n = 0;

	for (; k->fn != NULL; k++)
		if (k->hint != NULL && n < max)
			h[n++] = (struct layout_hint){ k->label, k->hint, k->prio, (int)k->group };
	return n;
}

void
ui_key_line(struct app *a, const struct ui_key *keys, int y, int w)
{
	struct layout_hint hints[40];
	size_t nh = ui_table_hints(keys, hints, 39);

	hints[nh++] = (struct layout_hint){ "?", "help", 0, UG_COUNT };
	ui_hints(a, y, w, hints, nh);
}

void
ui_footer(struct app *a, const struct ui_key *keys, int h, int w)
{
	struct layout_hint hints[40];
	size_t nh = ui_table_hints(keys, hints, 39);

	hints[nh++] = (struct layout_hint){ "?", "help", 0, UG_COUNT };
	ui_frame_bottom(a, hints, nh, h, w);
}

/* The key line: each key bold with its word after the key sign, tasks
 * parted by the group sign, so that neither colour nor reverse video is
 * needed to read it. */
void
ui_hints(struct app *a, int y, int w, const struct layout_hint *h, size_t n)
{
	unsigned char shown[64];
	struct layout_hint hh[64];
	int x = 0, prev = -1;

	if (n > sizeof shown)
		n = sizeof shown;
	memset(hh, 0, sizeof hh);
	for (size_t i = 0; i < n; i++) {
		hh[i] = h[i];
		hh[i].key = ui_key_label(a, h[i].key);
	}
	h = hh;
	layout_hints_pick(h, n, w - 1, shown);
	move(y, 0);
	clrtoeol();
	for (size_t i = 0; i < n; i++) {
		int kl, wl;

		if (!shown[i])
			continue;
		if (prev >= 0 && h[i].group != h[prev].group) {
			ui_put(a, y, x + 1, 1, ui_glyph(a, GL_GROUP), UC_DIM);
			x += LAYOUT_GROUP_GAP;
		} else if (prev >= 0) {
			x += 2;
		}
		kl = (int)utf8_cols(h[i].key);
		wl = (int)utf8_cols(layout_hint_word(&h[i], shown[i]));
		ui_put_attr(a, y, x, kl, h[i].key, ui_attr(a, UC_KEY) | A_BOLD);
		ui_put(a, y, x + kl, 1, ui_glyph(a, GL_KEY), UC_DIM);
		ui_put(a, y, x + kl + 1, wl, layout_hint_word(&h[i], shown[i]), UC_NORMAL);
		x += kl + 1 + wl;
		prev = (int)i;
	}
}

void
ui_box(struct app *a, int y, int x, int h, int w, const char *title)
{
	attr_t at = ui_attr(a, UC_FRAME);

	for (int r = y; r < y + h; r++)
		ui_fill(a, r, x, w, A_NORMAL);
	attrset(at);
	if (a->ascii) {
		mvaddch(y, x, '+');
		mvaddch(y, x + w - 1, '+');
		mvaddch(y + h - 1, x, '+');
		mvaddch(y + h - 1, x + w - 1, '+');
		mvhline(y, x + 1, '-', w - 2);
		mvhline(y + h - 1, x + 1, '-', w - 2);
		mvvline(y + 1, x, '|', h - 2);
		mvvline(y + 1, x + w - 1, '|', h - 2);
	} else {
		mvaddstr(y, x, "\u250c");
		mvaddstr(y, x + w - 1, "\u2510");
		mvaddstr(y + h - 1, x, "\u2514");
		mvaddstr(y + h - 1, x + w - 1, "\u2518");
		for (int i = 1; i < w - 1; i++) {
			mvaddstr(y, x + i, "\u2500");
			mvaddstr(y + h - 1, x + i, "\u2500");
		}
		for (int r = 1; r < h - 1; r++) {
			mvaddstr(y + r, x, "\u2502");
			mvaddstr(y + r, x + w - 1, "\u2502");
		}
	}
	attrset(A_NORMAL);
	if (title != NULL) {
		char *t = xasprintf(" %s ", title);

		ui_put(a, y, x + 2, (int)utf8_cols(t) < w - 4 ? (int)utf8_cols(t) : w - 4, t,
		    UC_HEADER);
		free(t);
	}
}

int
ui_key_match(const struct ui_key *k, int key)
{
	for (int i = 0; i < 4 && k->codes[i] != 0; i++)
		if (k->codes[i] == key)
			return 1;
	return 0;
}

int
ui_read_key(struct app *a, int timeout_ms)
{
	wint_t wc;
	int rc;

	(void)a;
	timeout(timeout_ms);
	rc = get_wch(&wc);
	if (rc == ERR)
		return -1;
	if (rc == KEY_CODE_YES)
		return UI_FKEY((int)wc);
	return (int)wc;
}

/* ---- the terminal ---- */

void
ui_term_restore(void)
{
	if (term_active) {
		term_active = 0;
		endwin();
	}
}

static void
fatal_signal(int sig)
{
	/* Give the terminal back, then die of the same signal. */
	ui_term_restore();
	signal(sig, SIG_DFL);
	raise(sig);
}

static void
install_fatal_handlers(void)
{
	static const int sigs[] = { SIGSEGV, SIGBUS, SIGFPE, SIGILL, SIGABRT };

	for (size_t i = 0; i < sizeof sigs / sizeof *sigs; i++) {
		struct sigaction sa;

		memset(&sa, 0, sizeof sa);
		sa.sa_handler = fatal_signal;
		sigemptyset(&sa.sa_mask);
		sa.sa_flags = SA_RESETHAND;
		sigaction(sigs[i], &sa, NULL);
	}
	{
		static const int stops[] = { SIGINT, SIGTERM, SIGHUP };

		for (size_t i = 0; i < sizeof stops / sizeof *stops; i++) {
			struct sigaction sa;

			memset(&sa, 0, sizeof sa);
			sa.sa_handler = stop_signal;
			sigemptyset(&sa.sa_mask);
			sigaction(stops[i], &sa, NULL);
		}
	}
}

int
ui_term_open(struct app *a, const struct ui_opts *o, char **cause)
{
	const char *cs;

	setlocale(LC_ALL, "");
	cs = nl_langinfo(CODESET);
	a->ascii = o->ascii >= 0 ? o->ascii : !(cs != NULL && strcmp(cs, "UTF-8") == 0);
	a->color = o->color;
	install_fatal_handlers();   /* before curses, so it keeps ours */
	if (o->out != NULL) {
		a->screen = newterm(o->term, o->out, o->in != NULL ? o->in : stdin);
		if (a->screen == NULL)
			return fail_with(cause, "cannot open terminal type '%s'",
			    o->term != NULL ? o->term : "?");
		set_term(a->screen);
	} else {
		if (!isatty(STDIN_FILENO) || !isatty(STDOUT_FILENO))
			return fail_with(cause, "the workbench needs a terminal; "
			    "for scripts use the commands (see --help)");
		a->screen = newterm(NULL, stdout, stdin);
		if (a->screen == NULL)
			return fail_with(cause, "cannot use terminal type '%s' (is TERM right?)",
			    getenv("TERM") != NULL ? getenv("TERM") : "");
		set_term(a->screen);
	}
	term_active = 1;
	util_set_oom_hook(ui_term_restore);
	cbreak();
	noecho();
	nonl();
	keypad(stdscr, TRUE);
	set_escdelay(25);
	curs_set(0);
	ui_colors_init(a);
	a->mouse = mousemask(BUTTON1_CLICKED | BUTTON1_DOUBLE_CLICKED | BUTTON1_PRESSED |
	    BUTTON4_PRESSED | BUTTON5_PRESSED, NULL) != 0;
	mouseinterval(200);
	return 0;
}

void
ui_term_close(void)
{
	ui_term_restore();
}

/* ---- the frame of the main screens ---- */

void
ui_frame(struct app *a, const char *where, const char *more, int h, int w)
{
	char *beam = NULL, *caution, *line;
	const char *sep = a->ascii ? " > " : " \u25b8 ";
	int bw = 0;

	(void)h;
	move(0, 0);
	clrtoeol();
	if (a->bench != NULL) {
		char wl[48], pw[48];
		const char *parts[4];
		int prio[4] = { 0, 0, 0, 1 };
		char *full = layout_beam_summary(a->shown, a->ascii);

		/* the beam first: its full form where there is room */
		{
			char *t = layout_quantity_text(a->shown->src.wavelength, DIM_LENGTH);
			char *u = a->ascii ? layout_ascii(t) : xstrdup(t);

			snprintf(wl, sizeof wl, "%s", u);
			free(t);
			free(u);
		}
		units_format(pw, sizeof pw, a->shown->src.power, DIM_POWER, 3, a->ascii);
		beam = xasprintf("%s %s%s", wl, pw, a->shown->src.pulsed ? " pulsed" : " CW");
		parts[0] = full;
		parts[1] = a->name;
		parts[2] = where;
		parts[3] = more;
		line = layout_join_fit(parts, prio, 4, sep, w - 1);
		if ((int)utf8_cols(line) > w - 1 || (more != NULL && strstr(line, more) == NULL)) {
			free(line);
			parts[0] = beam;
			line = layout_join_fit(parts, prio, 4, sep, w - 1);
			bw = (int)utf8_cols(beam);
		} else {
			bw = (int)utf8_cols(full);
		}
		free(full);
	} else {
		const char *parts[3] = { "beamledger", where, more };
		static const int prio[3] = { 0, 0, 1 };

		line = layout_join_fit(parts, prio, 3, sep, w - 1);
		bw = 10;
	}
	ui_put(a, 0, 0, w, line, UC_NORMAL);
	{
		/* the beam, in bold, is the start of the line as drawn */
		char *head = xasprintf("%.*s", (int)strlen(line), line);
		size_t cut = 0;

		for (int c = 0; head[cut] != '\0' && c < bw; cut++)
			if (((unsigned char)head[cut + 1] & 0xc0) != 0x80)
				c++;
		head[cut] = '\0';
		ui_put_attr(a, 0, 0, bw < w ? bw : w, head, ui_attr(a, UC_KEY) | A_BOLD);
		free(head);
	}
	free(line);
	free(beam);
	if (a->bench != NULL) {
		caution = layout_caution_line(a->shown, a->ascii, w - 3);
	} else {
		caution = xstrdup("design estimates, not a safety assessment: the laser "
		    "safety officer decides");
	}
	line = xasprintf("%s %s", ui_glyph(a, GL_HAZARD), caution);
	ui_put(a, 1, 0, w, line, UC_CAUTION);
	free(line);
	free(caution);
}

void
ui_frame_bottom(struct app *a, const struct layout_hint *hints, size_t nh, int h, int w)
{
	move(h - 3, 0);
	clrtoeol();
	if (a->msg != NULL)
		ui_put(a, h - 3, 0, w, a->msg, a->msg_error ? UC_ERROR : UC_INFO);
	if (a->bench != NULL && a->trace != NULL)
		wb_draw_status(a, h - 2, w);
	ui_hints(a, h - 1, w, hints, nh);
}
