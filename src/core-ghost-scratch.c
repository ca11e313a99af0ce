/* core-ghost-scratch.c - the ghost engine's buffers, kept in the trace
 * result between traces (struct ghost_scratch, core-ghost-impl.h): a
 * sweep or a tolerance run retraces the same bench thousands of times and
 * then allocates nothing once they have grown. */
#include <config.h>

#include <stdlib.h>
#include <string.h>

#include "core-ghost-impl.h"
#include "core-trace.h"
#include "util-err.h"

/* Kept rows past this many are handed back to the C library rather
 * than kept for the next trace (a long chain's run for JSON has 10⁶). */
#define SCRATCH_ROWS_KEPT 65536

void
ghost_scratch_free(struct ghost_scratch *s)
{
	if (s == NULL)
		return;
	for (int k = 0; k < 2; k++) {
		ghost_set_free(s->set[k]);
		free(s->acc[k]);
		free(s->fourth[k]);
		free(s->pend[k]);
	}
	free(s->prev);
	free(s->next);
	free(s->pass);
	free(s->split);
	free(s->tmp);
	free(s);
}

/* Set k of the scratch, emptied but with its buffers. */
void
ghost_scratch_put_set(struct ghost_scratch *s, int k, struct ghost_set *gs)
{
	struct ghost_set kept;

	if (gs->caprows > SCRATCH_ROWS_KEPT) {
		free(gs->rows);
		gs->rows = NULL;
		gs->caprows = 0;
	}
	memset(&kept, 0, sizeof kept);
	kept.g = gs->g;
	kept.cap = gs->cap;
	kept.rows = gs->rows;
	kept.caprows = gs->caprows;
	kept.foci = gs->foci;
	kept.capfoci = gs->capfoci;
	kept.strays = gs->strays;
	kept.capstrays = gs->capstrays;
	kept.at = gs->at;
	kept.capat = gs->capat;
	*gs = kept;
	ghost_set_free(s->set[k]);
	s->set[k] = gs;
}

void
ghost_recycle(struct trace *t)
{
	if (t->ghosts == NULL)
		return;
	if (t->gscratch == NULL)
		t->gscratch = xcalloc(1, sizeof *t->gscratch);
	ghost_scratch_put_set(t->gscratch, 0, t->ghosts);
	t->ghosts = NULL;
}

/* An empty set with room for n summaries, from the scratch when it has
 * one (the caller owns it). */
struct ghost_set *
ghost_scratch_take_set(struct ghost_scratch *s, int k, size_t n)
{
	struct ghost_set *gs = s->set[k];

	s->set[k] = NULL;
	if (gs == NULL)
		gs = xcalloc(1, sizeof *gs);
	if (gs->capat < n || gs->at == NULL) {
		free(gs->at);
		gs->capat = n ? n : 1;
		gs->at = xmalloc(gs->capat * sizeof *gs->at);
	}
	return gs;
}

/* The per-row arrays for n rows (contents undefined). */
void
ghost_scratch_rows(struct ghost_scratch *s, size_t n)
{
	if (s->cap >= n && s->prev != NULL)
		return;
	s->cap = n ? n : 1;
	free(s->prev);
	free(s->next);
	free(s->pass);
	free(s->split);
	s->prev = xmalloc(s->cap * sizeof *s->prev);
	s->next = xmalloc(s->cap * sizeof *s->next);
	s->pass = xmalloc(s->cap * sizeof *s->pass);
	s->split = xmalloc(4 * s->cap * sizeof *s->split);
	for (int k = 0; k < 2; k++) {
		free(s->acc[k]);
		free(s->fourth[k]);
		s->acc[k] = xmalloc(s->cap * sizeof *s->acc[k]);
		s->fourth[k] = xmalloc(s->cap * sizeof *s->fourth[k]);
	}
}

/* n longs for one step's own use (rows linked, ghosts renumbered, sparks
 * per gap: one after the other, never two at once). */
long *
ghost_scratch_longs(struct ghost_scratch *s, size_t n)
{
	if (n == 0)
		n = 1;
	if (s->captmp < n) {
		free(s->tmp);
		s->tmp = xmalloc(n * sizeof *s->tmp);
		s->captmp = n;
	}
	return s->tmp;
}
