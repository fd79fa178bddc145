package store

import (
	"context"
	"sync/atomic"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgxpool"
)

// Timeouts on the client side. The server's statement_timeout ends a slow statement,
// but a server that does not answer at all (frozen, or a network that drops packets)
// cannot end anything: without a deadline of our own a request would wait for the
// operating system's TCP timeout (minutes). So every statement (query, exec, batch,
// COPY) gets a deadline a little after the server's statement timeout, and every wait
// for a pooled connection gets the acquire timeout. A caller's earlier deadline wins.
// When a deadline passes pgx cancels the statement and closes the connection, and the
// error wraps context.DeadlineExceeded (answered 503 by the handlers).

// statementGrace is how long after the server's statement timeout the client gives up
// on its own: time for the server's cancellation to arrive first when it can.
const statementGrace = 2 * time.Second

type cancelKey struct{}

// deadlineTracer puts the deadlines above on each statement and acquire through pgx's
// tracer hooks, whose returned context is the one the operation runs with; the matching
// end hook releases the timer.
type deadlineTracer struct {
	statement atomic.Int64 // time.Duration; 0: no statement deadline (set once, after connecting)
	acquire   time.Duration
}

func withDeadline(ctx context.Context, d time.Duration) context.Context {
	if d <= 0 {
		return ctx
	}
	ctx, cancel := context.WithTimeout(ctx, d)
	return context.WithValue(ctx, cancelKey{}, cancel)
}

func release(ctx context.Context) {
	if cancel, ok := ctx.Value(cancelKey{}).(context.CancelFunc); ok {
		cancel()
	}
}

func (t *deadlineTracer) TraceQueryStart(ctx context.Context, _ *pgx.Conn, _ pgx.TraceQueryStartData) context.Context {
	return withDeadline(ctx, time.Duration(t.statement.Load()))
}

func (t *deadlineTracer) TraceQueryEnd(ctx context.Context, _ *pgx.Conn, _ pgx.TraceQueryEndData) {
	release(ctx)
}

func (t *deadlineTracer) TraceBatchStart(ctx context.Context, _ *pgx.Conn, _ pgx.TraceBatchStartData) context.Context {
	return withDeadline(ctx, time.Duration(t.statement.Load()))
}

func (t *deadlineTracer) TraceBatchQuery(context.Context, *pgx.Conn, pgx.TraceBatchQueryData) {}

func (t *deadlineTracer) TraceBatchEnd(ctx context.Context, _ *pgx.Conn, _ pgx.TraceBatchEndData) {
	release(ctx)
}

func (t *deadlineTracer) TraceCopyFromStart(ctx context.Context, _ *pgx.Conn, _ pgx.TraceCopyFromStartData) context.Context {
	return withDeadline(ctx, time.Duration(t.statement.Load()))
}

func (t *deadlineTracer) TraceCopyFromEnd(ctx context.Context, _ *pgx.Conn, _ pgx.TraceCopyFromEndData) {
	release(ctx)
}

func (t *deadlineTracer) TraceAcquireStart(ctx context.Context, _ *pgxpool.Pool, _ pgxpool.TraceAcquireStartData) context.Context {
	return withDeadline(ctx, t.acquire)
}

func (t *deadlineTracer) TraceAcquireEnd(ctx context.Context, _ *pgxpool.Pool, _ pgxpool.TraceAcquireEndData) {
	release(ctx)
}
