/* ui-line.c - typing: a one-line UTF-8 editor, and the small modal panes
 * built on it and beside it (prompt, yes/no question, menu), plus the
 * scrollable text screen used by help and diff.  Owned by the workbench. */
#include <config.h>

#include <stdlib.h>
#include <string.h>
#include <wchar.h>

#include "ui-app.h"
#include "util-err.h"

/* ---- the line editor ---- */

static void
line_reserve(struct ui_line *l, size_t more)
{
	if (l->len + more + 1 > l->cap) {
		l->cap = (l->len + more + 1) * 2;
		l->s = xrealloc(l->s, l->cap);
	}
}

void
ui_line_set(struct ui_line *l, const char *s)
{
	size_t n = strlen(s != NULL ? s : "");

	l->len = 0;
	line_reserve(l, n);
	memcpy(l->s, s != NULL ? s : "", n + 1);
	l->len = l->cur = n;
	l->fresh = n > 0;
}

void
ui_line_release(struct ui_line *l)
{
	free(l->s);
	memset(l, 0, sizeof *l);
}

static size_t
prev_cp(const struct ui_line *l, size_t i)
{
	while (i > 0 && ((unsigned char)l->s[--i] & 0xc0) == 0x80)
		;
	return i;
}

static size_t
next_cp(const struct ui_line *l, size_t i)
{
	if (i < l->len)
		i++;
	while (i < l->len && ((unsigned char)l->s[i] & 0xc0) == 0x80)
		i++;
	return i;
}

static void
cut(struct ui_line *l, size_t a, size_t b)
{
	memmove(l->s + a, l->s + b, l->len - b + 1);
	l->len -= b - a;
	l->cur = a;
}

int
ui_line_key(struct ui_line *l, int key)
{
	int fresh;

	if (l->s == NULL)
		ui_line_set(l, "");
	/* A value shown as it was set is replaced by what is typed, as in a
	 * form; moving or deleting first keeps it for editing. */
	fresh = l->fresh;
	l->fresh = 0;
	switch (key) {
	case UI_FKEY(KEY_LEFT):
	case UI_CTRL('b'):
		l->cur = prev_cp(l, l->cur);
		return 1;
	case UI_FKEY(KEY_RIGHT):
	case UI_CTRL('f'):
		l->cur = next_cp(l, l->cur);
		return 1;
	case UI_FKEY(KEY_HOME):
	case UI_CTRL('a'):
		l->cur = 0;
		return 1;
	case UI_FKEY(KEY_END):
	case UI_CTRL('e'):
		l->cur = l->len;
		return 1;
	case UI_FKEY(KEY_BACKSPACE):
	case 127:
	case UI_CTRL('h'):
		if (l->cur > 0)
			cut(l, prev_cp(l, l->cur), l->cur);
		return 1;
	case UI_FKEY(KEY_DC):
	case UI_CTRL('d'):
		if (l->cur < l->len)
			cut(l, l->cur, next_cp(l, l->cur));
		return 1;
	case UI_CTRL('u'):
		cut(l, 0, l->cur);
		return 1;
	case UI_CTRL('k'):
		l->s[l->cur] = '\0';
		l->len = l->cur;
		return 1;
	case UI_CTRL('w'): {
		size_t a = l->cur;

		while (a > 0 && l->s[a - 1] == ' ')
			a--;
		while (a > 0 && l->s[a - 1] != ' ')
			a--;
		cut(l, a, l->cur);
		return 1;
	}
	default:
		break;
	}
	if (UI_IS_FKEY(key) || key < 32 || key == 127) {
		l->fresh = fresh;
		return 0;
	}
	if (fresh) {
		l->len = l->cur = 0;
		l->s[0] = '\0';
	}
	{
		char mb[8];
		mbstate_t ps;
		size_t n;

		memset(&ps, 0, sizeof ps);
		n = wcrtomb(mb, (wchar_t)key, &ps);
		if (n == (size_t)-1) {
			/* not in this locale's charset: UTF-8 by hand */
			if (key < 0x800) {
				mb[0] = (char)(0xc0 | (key >> 6));
				mb[1] = (char)(0x80 | (key & 0x3f));
				n = 2;
			} else {
				return 1;
			}
		}
		line_reserve(l, n);
		memmove(l->s + l->cur + n, l->s + l->cur, l->len - l->cur + 1);
		memcpy(l->s + l->cur, mb, n);
		l->len += n;
		l->cur += n;
	}
	return 1;
}

void
ui_line_draw(struct app *a, struct ui_line *l, int y, int x, int w)
{
	size_t start = 0;
	int before, shown;
	char *vis;

	if (l->s == NULL)
		ui_line_set(l, "");
	/* the box: its edges drawn, so it reads as a box without colour */
	if (w >= 4) {
		ui_put(a, y, x, 1, "[", UC_KEY);
		ui_put(a, y, x + w - 1, 1, "]", UC_KEY);
		x++;
		w -= 2;
	}
	/* scroll so the cursor is inside */
	for (;;) {
		char save = l->s[l->cur];

		l->s[l->cur] = '\0';
		before = (int)utf8_cols(l->s + start);
		l->s[l->cur] = save;
		if (before < w - 1 || start >= l->cur)
			break;
		start = next_cp(l, start);
	}
	vis = l->s + start;
	ui_fill(a, y, x, w, ui_attr(a, UC_INPUT));
	shown = (int)utf8_cols(vis);
	ui_put(a, y, x, shown < w ? shown : w, vis, l->fresh ? UC_SELECT : UC_INPUT);
	a->cursor_y = y;
	a->cursor_x = x + before;
}

/* ---- prompt ---- */

struct prompt {
	char          *title, *help;
	struct ui_line line;
	ui_prompt_fn   fn;
	void          *arg;
	void         (*arg_free)(void *);
	char          *error;
};

static void
prompt_release(struct ui_pane *p)
{
	struct prompt *d = p->data;

	free(d->title);
	free(d->help);
	ui_line_release(&d->line);
	if (d->arg_free != NULL)
		d->arg_free(d->arg);
	free(d->error);
	free(d);
}

static int
wrapped(struct app *a, const char *s, int y, int x, int w, int maxl, enum ui_color c)
{
	size_t st[8], ln[8], n = layout_wrap(s, w, st, ln, 8);

	if ((int)n > maxl)
		n = (size_t)maxl;
	for (size_t i = 0; i < n && i < 8; i++) {
		char *t = xstrdup(s + st[i]);

		t[ln[i]] = '\0';
		ui_put(a, y + (int)i, x, w, t, c);
		free(t);
	}
	return (int)n;
}

static void
prompt_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct prompt *d = p->data;
	int bw = w - 8 > 76 ? 76 : w - 8, bh = 10, y = (h - bh) / 2, x = (w - bw) / 2;

	ui_box(a, y, x, bh, bw, d->title);
	wrapped(a, d->help, y + 1, x + 2, bw - 4, 3, UC_NORMAL);
	ui_line_draw(a, &d->line, y + 4, x + 2, bw - 4);
	if (d->error != NULL)
		wrapped(a, d->error, y + 5, x + 2, bw - 4, 2, UC_ERROR);
	{
		struct layout_hint hh[2] = { { "Enter", "accept", 0, UG_VALUES },
			{ "Esc", "cancel", 0, UG_LEAVE } };
		char *t = layout_hints_text(hh, 2, bw - 4);
		char *u = a->ascii ? layout_ascii(t) : xstrdup(t);

		ui_put(a, y + bh - 2, x + 2, bw - 4, u, UC_DIM);
		free(t);
		free(u);
	}
}

static enum ui_reaction
prompt_accept(struct app *a, struct ui_pane *p)
{
	struct prompt *d = p->data;
	char *cause = NULL, *text = xstrdup(d->line.s != NULL ? d->line.s : "");
	int rc;

	free(d->error);
	d->error = NULL;
	rc = d->fn(a, d->arg, text, &cause);
	free(text);
	if (rc != 0) {
		d->error = cause != NULL ? cause : xstrdup("refused");
		return UI_REDRAW;
	}
	free(cause);
	return UI_POP | UI_REDRAW;
}

static enum ui_reaction
prompt_cancel(struct app *a, struct ui_pane *p)
{
	(void)a;
	(void)p;
	return UI_POP | UI_REDRAW;
}

static enum ui_reaction
prompt_key(struct app *a, struct ui_pane *p, int key)
{
	struct prompt *d = p->data;

	(void)a;
	return ui_line_key(&d->line, key) ? UI_REDRAW : UI_NONE;
}

static const struct ui_key prompt_keys[] = {
	{ { '\r', '\n', UI_FKEY(KEY_ENTER) }, "Enter", "accept", 0, "accept the text", prompt_accept, 0, UG_VALUES },
	{ { UI_ESC }, "Esc", "cancel", 0, "close without changing anything", prompt_cancel, 0, UG_LEAVE },
	UI_KEYS_END,
};

static const struct ui_pane_ops prompt_ops = {
	"text field", 1, prompt_keys, prompt_draw, prompt_key, NULL, NULL, NULL, prompt_release,
};

void
ui_prompt(struct app *a, const char *title, const char *help, const char *init,
    ui_prompt_fn fn, void *arg, void (*arg_free)(void *))
{
	struct prompt *d = xcalloc(1, sizeof *d);

	d->title = xstrdup(title);
	d->help = xstrdup(help != NULL ? help : "");
	ui_line_set(&d->line, init);
	d->fn = fn;
	d->arg = arg;
	d->arg_free = arg_free;
	app_push(a, &prompt_ops, d);
}

/* ---- yes / no ---- */

struct confirm {
	char          *question;
	ui_confirm_fn  fn;
	void          *arg;
};

static void
confirm_release(struct ui_pane *p)
{
	struct confirm *d = p->data;

	free(d->question);
	free(d);
}

static void
confirm_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct confirm *d = p->data;
	int bw = w - 8 > 70 ? 70 : w - 8, bh = 7, y = (h - bh) / 2, x = (w - bw) / 2;

	ui_box(a, y, x, bh, bw, "question");
	wrapped(a, d->question, y + 1, x + 2, bw - 4, 3, UC_NORMAL);
	{
		struct layout_hint hh[2] = { { "y", "yes", 0, UG_VALUES }, { "n", "no (also Esc)", 0, UG_LEAVE } };
		char *t = layout_hints_text(hh, 2, bw - 4), *u = a->ascii ? layout_ascii(t) : xstrdup(t);

		ui_put(a, y + bh - 2, x + 2, bw - 4, u, UC_KEY);
		free(t);
		free(u);
	}
}

static enum ui_reaction
confirm_answer(struct app *a, struct ui_pane *p, int yes)
{
	struct confirm *d = p->data;
	ui_confirm_fn fn = d->fn;
	void *arg = d->arg;

	/* close first: the answer may open another pane */
	app_pop(a);
	fn(a, arg, yes);
	return UI_REDRAW;
}

static enum ui_reaction
confirm_yes(struct app *a, struct ui_pane *p)
{
	return confirm_answer(a, p, 1);
}

static enum ui_reaction
confirm_no(struct app *a, struct ui_pane *p)
{
	return confirm_answer(a, p, 0);
}

static const struct ui_key confirm_keys[] = {
	{ { 'y', 'Y' }, "y", "yes", 0, "answer yes", confirm_yes, 0, UG_VALUES },
	{ { 'n', 'N', UI_ESC }, "n", "no", 0, "answer no (also Esc)", confirm_no, 0, UG_VALUES },
	UI_KEYS_END,
};

static enum ui_reaction
confirm_swallow(struct app *a, struct ui_pane *p, int key)
{
	(void)a;
	(void)p;
	(void)key;
	return UI_NONE;             /* a question waits for y or n */
}

static const struct ui_pane_ops confirm_ops = {
	"question", 1, confirm_keys, confirm_draw, confirm_swallow, NULL, NULL, NULL,
	confirm_release,
};

void
ui_confirm(struct app *a, const char *question, ui_confirm_fn fn, void *arg)
{
	struct confirm *d = xcalloc(1, sizeof *d);

	d->question = xstrdup(question);
	d->fn = fn;
	d->arg = arg;
	app_push(a, &confirm_ops, d);
}

/* ---- menu ---- */

struct menu {
	char        *title;
	char       **items;         /* owned: "key\tlabel\thelp" */
	size_t       n;
	int          sel;
	ui_menu_fn   fn;
	void        *arg;
};

static void
menu_release(struct ui_pane *p)
{
	struct menu *d = p->data;

	for (size_t i = 0; i < d->n; i++)
		free(d->items[i]);
	free(d->items);
	free(d->title);
	free(d);
}

static void
menu_field(const char *item, int which, char *out, size_t n)
{
	const char *s = item;
	size_t l;

	for (int i = 0; i < which && s != NULL; i++) {
		s = strchr(s, '\t');
		if (s != NULL)
			s++;
	}
	if (s == NULL) {
		out[0] = '\0';
		return;
	}
	l = strcspn(s, "\t");
	if (l >= n)
		l = n - 1;
	memcpy(out, s, l);
	out[l] = '\0';
}

static void
menu_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct menu *d = p->data;
	int bw = w - 8 > 66 ? 66 : w - 8, bh = (int)d->n + 4, y, x = (w - bw) / 2;

	if (bh > h - 2)
		bh = h - 2;
	y = (h - bh) / 2;
	ui_box(a, y, x, bh, bw, d->title);
	for (int i = 0; i < (int)d->n && i < bh - 4; i++) {
		char k[16], label[64], help[160];
		attr_t at = i == d->sel ? ui_attr(a, UC_SELECT) : A_NORMAL;

		menu_field(d->items[i], 0, k, sizeof k);
		menu_field(d->items[i], 1, label, sizeof label);
		menu_field(d->items[i], 2, help, sizeof help);
		ui_fill(a, y + 1 + i, x + 1, bw - 2, at);
		ui_put_attr(a, y + 1 + i, x + 2, 3, k, at | ui_attr(a, UC_KEY));
		ui_put_attr(a, y + 1 + i, x + 5, 11, label, at);
		ui_put_attr(a, y + 1 + i, x + 17, bw - 19, help, at | (i == d->sel ? 0 : ui_attr(a, UC_DIM)));
	}
	{
		struct layout_hint hh[3] = { { "\u2191\u2193", "choose", 0, UG_MOVE },
			{ "Enter", "pick (or its letter)", 0, UG_VALUES }, { "Esc", "cancel", 0, UG_LEAVE } };
		char *t = layout_hints_text(hh, 3, bw - 4), *u = a->ascii ? layout_ascii(t) : xstrdup(t);

		ui_put(a, y + bh - 2, x + 2, bw - 4, u, UC_DIM);
		free(t);
		free(u);
	}
}

static enum ui_reaction
menu_pick(struct app *a, struct ui_pane *p, int i)
{
	struct menu *d = p->data;
	ui_menu_fn fn = d->fn;
	void *arg = d->arg;

	app_pop(a);
	fn(a, arg, i);
	return UI_REDRAW;
}

static enum ui_reaction
menu_enter(struct app *a, struct ui_pane *p)
{
	return menu_pick(a, p, ((struct menu *)p->data)->sel);
}

static enum ui_reaction
menu_up(struct app *a, struct ui_pane *p)
{
	struct menu *d = p->data;

	(void)a;
	d->sel = d->sel > 0 ? d->sel - 1 : (int)d->n - 1;
	return UI_REDRAW;
}

static enum ui_reaction
menu_down(struct app *a, struct ui_pane *p)
{
	struct menu *d = p->data;

	(void)a;
	d->sel = d->sel + 1 < (int)d->n ? d->sel + 1 : 0;
	return UI_REDRAW;
}

static enum ui_reaction
menu_key(struct app *a, struct ui_pane *p, int key)
{
	struct menu *d = p->data;

	for (size_t i = 0; i < d->n; i++) {
		char k[16];

		menu_field(d->items[i], 0, k, sizeof k);
		if (k[0] != '\0' && k[1] == '\0' && key == (unsigned char)k[0])
			return menu_pick(a, p, (int)i);
	}
	return UI_NONE;
}

static enum ui_reaction
menu_click(struct app *a, struct ui_pane *p, int y, int x, int dbl)
{
	struct menu *d = p->data;
	int h = LINES, bh = (int)d->n + 4, top;

	(void)x;
	(void)dbl;
	if (bh > h - 2)
		bh = h - 2;
	top = (h - bh) / 2 + 1;
	if (y >= top && y < top + (int)d->n)
		return menu_pick(a, p, y - top);
	return UI_NONE;
}

static const struct ui_key menu_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191", NULL, 0, "previous item", menu_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, "next item", menu_down, 0, UG_MOVE },
	{ { '\r', '\n', UI_FKEY(KEY_ENTER) }, "Enter", "pick", 0, "pick the highlighted item", menu_enter, 0, UG_VALUES },
	{ { UI_ESC }, "Esc", "cancel", 0, "close the menu", prompt_cancel, 0, UG_LEAVE },
	UI_KEYS_END,
};

static const struct ui_pane_ops menu_ops = {
	"menu", 1, menu_keys, menu_draw, menu_key, menu_click, NULL, NULL, menu_release,
};

void
ui_menu(struct app *a, const char *title, const char *const *items, size_t n,
    ui_menu_fn fn, void *arg)
{
	struct menu *d = xcalloc(1, sizeof *d);

	d->title = xstrdup(title);
	d->items = xcalloc(n ? n : 1, sizeof *d->items);
	for (size_t i = 0; i < n; i++)
		d->items[i] = xstrdup(items[i]);
	d->n = n;
	d->fn = fn;
	d->arg = arg;
	app_push(a, &menu_ops, d);
}

/* ---- a text screen ---- */

struct textv {
	char   *title;
	char   *text;               /* owned */
	size_t *start, *len;        /* owned: lines */
	size_t  n;
	int     top, left, rows;
};

static void
text_release(struct ui_pane *p)
{
	struct textv *d = p->data;

	free(d->title);
	free(d->text);
	free(d->start);
	free(d->len);
	free(d);
}

static void
text_draw(struct app *a, struct ui_pane *p, int h, int w)
{
	struct textv *d = p->data;
	char *t;

	d->rows = h - 3;
	if (d->top > (int)d->n - d->rows)
		d->top = (int)d->n - d->rows;
	if (d->top < 0)
		d->top = 0;
	t = xasprintf("lines %d-%d of %zu", d->n ? d->top + 1 : 0,
	    d->top + d->rows < (int)d->n ? d->top + d->rows : (int)d->n, d->n);
	ui_frame(a, d->title, t, h, w);
	free(t);
	for (int r = 0; r < d->rows && d->top + r < (int)d->n; r++) {
		size_t i = (size_t)(d->top + r);
		char *line = xstrdup(d->text + d->start[i]);
		const char *vis = line;
		enum ui_color c = UC_NORMAL;

		line[d->len[i]] = '\0';
		for (int k = 0; k < d->left && *vis != '\0'; k++) {
			vis++;
			while (((unsigned char)*vis & 0xc0) == 0x80)
				vis++;
		}
		if (strstr(line, " over") != NULL || strstr(line, "OVER") != NULL)
			c = UC_OVER;
		else if (strstr(line, "caution") != NULL)
			c = UC_CAUTION;
		else if (line[0] != ' ' && line[0] != '\0' && line[strlen(line) - 1] == ':')
			c = UC_HEADER;
		ui_put(a, 2 + r, 0, w, vis, c);
		free(line);
	}
	ui_key_line(a, p->ops->keys, h - 1, w);
}

static enum ui_reaction
text_scroll(struct ui_pane *p, int by)
{
	struct textv *d = p->data;

	d->top += by;
	if (d->top > (int)d->n - d->rows)
		d->top = (int)d->n - d->rows;
	if (d->top < 0)
		d->top = 0;
	return UI_REDRAW;
}

static enum ui_reaction
text_up(struct app *a, struct ui_pane *p)
{
	(void)a;
	return text_scroll(p, -1);
}

static enum ui_reaction
text_down(struct app *a, struct ui_pane *p)
{
	(void)a;
	return text_scroll(p, 1);
}

static enum ui_reaction
text_pgup(struct app *a, struct ui_pane *p)
{
	(void)a;
	return text_scroll(p, -((struct textv *)p->data)->rows + 1);
}

static enum ui_reaction
text_pgdn(struct app *a, struct ui_pane *p)
{
	(void)a;
	return text_scroll(p, ((struct textv *)p->data)->rows - 1);
}

static enum ui_reaction
text_home(struct app *a, struct ui_pane *p)
{
	(void)a;
	((struct textv *)p->data)->top = 0;
	return UI_REDRAW;
}

static enum ui_reaction
text_end(struct app *a, struct ui_pane *p)
{
	(void)a;
	return text_scroll(p, (int)((struct textv *)p->data)->n);
}

static enum ui_reaction
text_left(struct app *a, struct ui_pane *p)
{
	struct textv *d = p->data;

	(void)a;
	d->left = d->left > 8 ? d->left - 8 : 0;
	return UI_REDRAW;
}

static enum ui_reaction
text_right(struct app *a, struct ui_pane *p)
{
	(void)a;
	((struct textv *)p->data)->left += 8;
	return UI_REDRAW;
}

const struct ui_key ui_text_keys[] = {
	{ { UI_FKEY(KEY_UP) }, "\u2191\u2193", "scroll", 1, "scroll a line", text_up, 0, UG_MOVE },
	{ { UI_FKEY(KEY_DOWN) }, "\u2193", NULL, 0, NULL, text_down, 0, UG_MOVE },
	{ { UI_FKEY(KEY_PPAGE) }, "PgUp", NULL, 0, "up a page", text_pgup, 0, UG_MOVE },
	{ { UI_FKEY(KEY_NPAGE), ' ' }, "PgDn", "page", 2, "down a page (also Space)", text_pgdn, 0, UG_MOVE },
	{ { UI_FKEY(KEY_HOME) }, "Home", "top", 3, "the top", text_home, 0, UG_MOVE },
	{ { UI_FKEY(KEY_END) }, "End", "end", 3, "the end", text_end, 0, UG_MOVE },
	{ { UI_FKEY(KEY_LEFT) }, "\u2190\u2192", "sideways", 4, "sideways (long lines)", text_left, 0, UG_MOVE },
	{ { UI_FKEY(KEY_RIGHT) }, "\u2192", NULL, 0, NULL, text_right, 0, UG_MOVE },
	{ { UI_ESC, 'q', UI_FKEY(KEY_BACKSPACE), 127 }, "Esc", "back", 0, "back (also q)", prompt_cancel, 0, UG_LEAVE },
	UI_KEYS_END,
};

const struct ui_pane_ops ui_text_ops = {
	"text screens (help, compare)", 0, ui_text_keys, text_draw, NULL, NULL, NULL, NULL,
	text_release,
};

void
ui_text_view(struct app *a, const char *title, char *text)
{
	struct textv *d = xcalloc(1, sizeof *d);
	size_t max;

	d->title = xstrdup(title);
	d->text = text;
	max = layout_wrap(text, 100000, NULL, NULL, 0);
	d->start = xcalloc(max + 1, sizeof *d->start);
	d->len = xcalloc(max + 1, sizeof *d->len);
	d->n = layout_wrap(text, 100000, d->start, d->len, max);
	/* a final newline makes no empty last line */
	if (d->n > 0 && d->len[d->n - 1] == 0)
		d->n--;
	app_push(a, &ui_text_ops, d);
}
