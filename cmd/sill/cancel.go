package main

import (
	"context"
	"io"
)

// The readers of package scores read in blocks (the block reader two
// megabytes at a time, the line reader through a buffer), so a reader that
// fails once ctx ends stops a load within a block of an interrupt, without
// the readers knowing about contexts.

// readerWithContext returns r, failing with ctx's error once ctx ends.
func readerWithContext(ctx context.Context, r io.Reader) io.Reader { return contextReader{ctx, r} }

// readSeekerWithContext is readerWithContext for an io.ReadSeeker.
func readSeekerWithContext(ctx context.Context, r io.ReadSeeker) io.ReadSeeker {
	return contextReadSeeker{contextReader{ctx, r}, r}
}

// readerAtWithContext is readerWithContext for an io.ReaderAt.
func readerAtWithContext(ctx context.Context, r io.ReaderAt) io.ReaderAt {
	return contextReaderAt{ctx, r}
}

type contextReader struct {
	ctx context.Context
	r   io.Reader
}

func (c contextReader) Read(p []byte) (int, error) {
	if err := c.ctx.Err(); err != nil {
		return 0, err
	}
	return c.r.Read(p)
}

type contextReadSeeker struct {
	contextReader
	s io.Seeker
}

func (c contextReadSeeker) Seek(offset int64, whence int) (int64, error) {
	return c.s.Seek(offset, whence)
}

type contextReaderAt struct {
	ctx context.Context
	r   io.ReaderAt
}

func (c contextReaderAt) ReadAt(p []byte, off int64) (int, error) {
	if err := c.ctx.Err(); err != nil {
		return 0, err
	}
	return c.r.ReadAt(p, off)
}
